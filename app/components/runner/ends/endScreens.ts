// What later.ts loads on demand: the end-of-run screens (a practice run's too).
export { DoneScreen } from "./DoneScreen";
export { OutcomeScreen } from "./OutcomeScreen";
export { PracticeDoneScreen, PracticeEndScreen } from "../practice/PracticeEnd";
