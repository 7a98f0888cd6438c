// The end-of-run screens (recording the outcome with its parts, the finished job and sending the
// report) in a chunk of their own: a technician needs them once per run, at its end, so they stay
// out of the first download (the runner route's own JavaScript, issue 14). Runner fetches the chunk
// as soon as its first screen is up, so it is there long before a run reaches its end.
import { lazy } from "react";

export const loadEndScreens = () => import("./endScreens");
export const OutcomeScreen = lazy(() => loadEndScreens().then((m) => ({ default: m.OutcomeScreen })));
export const DoneScreen = lazy(() => loadEndScreens().then((m) => ({ default: m.DoneScreen })));
export const PracticeEndScreen = lazy(() => loadEndScreens().then((m) => ({ default: m.PracticeEndScreen })));
export const PracticeDoneScreen = lazy(() => loadEndScreens().then((m) => ({ default: m.PracticeDoneScreen })));
