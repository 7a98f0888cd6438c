// Training: scenario scripts (the hidden fault and the world the trainee meets), practice runs
// (the trainee's own call on each reading) and the review of a practice run against the
// reference path. Pure, on the engine's public traversal; the phone needs only ./practice.
export { callsAt, practiceReplay, practiceTryEntry, PracticeRun } from "./practice";
export type { PracticeEntry, PracticeReading } from "./practice";
export { checkScript, walkScript, nodesToward, isScriptedKind } from "./script";
export type { Script, Scripted, World, ReferenceWalk, ScriptCheck } from "./script";
export { reviewPractice, median } from "./compare";
export type { PracticeReview, ReviewRow, ReviewStep, RowKind, StepFlags, MisjudgedReading, UndoEntry, TraineeRun } from "./compare";
