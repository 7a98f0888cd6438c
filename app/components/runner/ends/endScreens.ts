// What later.ts loads on demand: the end-of-run screens.
export { DoneScreen } from "./DoneScreen";
export { OutcomeScreen } from "./OutcomeScreen";
