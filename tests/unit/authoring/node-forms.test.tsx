// @vitest-environment jsdom
// The node panel's forms, rendered with the editor's own reducer: what is typed is checked with
// the engine's zod schemas, only valid values reach the draft, and the limit preview gives the
// engine's verdict.
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { useReducer } from "react";
import { afterEach, describe, expect, it } from "vitest";
import { draftReducer, initDraft, type DraftState } from "../../../app/components/editor/draft";
import { NodeForm } from "../../../app/components/editor/NodeForm";
import { TreeForm } from "../../../app/components/editor/TreeForm";
import type { Tree } from "../../../app/engine/types";
import { smallTree } from "../../support/trees";

afterEach(cleanup);

function mount(tree: Tree, selected: string | null) {
  const seen: { state: DraftState } = { state: initDraft(tree, {}) };
  function Harness() {
    const [state, dispatch] = useReducer(draftReducer, undefined, () => ({ ...initDraft(tree, {}), selected }));
    seen.state = state;
    const node = state.tree.nodes.find((n) => n.id === state.selected);
    return node ? (
      <NodeForm key={node.id} node={node} tree={state.tree} dispatch={dispatch} findings={[]} />
    ) : (
      <TreeForm tree={state.tree} dispatch={dispatch} />
    );
  }
  render(<Harness />);
  return seen;
}

const node = (s: { state: DraftState }, id: string) => s.state.tree.nodes.find((n) => n.id === id)!;
const type = (label: string, value: string) => fireEvent.change(screen.getByLabelText(label), { target: { value } });

describe("measurement form", () => {
  it("the live preview gives the runner's verdict for a sample reading (1.5 µF ± 6 %: trade practice for a fan-motor run capacitor)", () => {
    mount(smallTree(), "cap-measure");
    expect(screen.getByText("1.41–1.59 µF")).toBeTruthy();
    type("Sample reading", "1.40");
    expect(screen.getByText("1.40 µF → low: below 1.41 µF")).toBeTruthy();
    type("Sample reading", "1.47 µF");
    expect(screen.getByText("1.47 µF → within 1.41–1.59 µF")).toBeTruthy();
    type("Sample reading", "1600 nF");
    expect(screen.getByText(/→ high: above 1\.59 µF/)).toBeTruthy();
    type("Sample reading", "12 V");
    expect(screen.getByText(/Expected a capacitance, got a voltage/)).toBeTruthy();
  });

  it("a number that isn't one is shown beside the field and never reaches the draft; a good one does", () => {
    const s = mount(smallTree(), "cap-measure");
    const before = s.state.tree;
    type("Rated value (number)", "1,5");
    expect(screen.getByText("Enter a number, like 1.5.")).toBeTruthy();
    expect(s.state.tree).toBe(before);
    type("Rated value (number)", "1.6");
    expect(screen.queryByText("Enter a number, like 1.5.")).toBeNull();
    const m = node(s, "cap-measure");
    expect(m.kind === "measurement" && m.limits).toEqual({
      kind: "nominal",
      nominal: { value: 1.6 },
      tolerance: { kind: "percent", plus: 6, minus: 6 },
    });
    // The preview follows: 1.6 µF ± 6 % is 1.504–1.696 µF.
    expect(screen.getByText("1.504–1.696 µF")).toBeTruthy();
  });

  it("a unit the engine's schema refuses gets the engine's message; a known unit is taken", () => {
    const s = mount(smallTree(), "cap-measure");
    type("Unit", "u F");
    expect(screen.getByText("A unit is one word like µF, V, °F or inWC.")).toBeTruthy();
    expect(node(s, "cap-measure")).toMatchObject({ unit: "µF" });
    type("Unit", "nF");
    expect(node(s, "cap-measure")).toMatchObject({ unit: "nF" });
  });

  it("changing the quantity swaps a unit of the old quantity for the new one's usual unit", () => {
    const s = mount(smallTree(), "cap-measure");
    fireEvent.change(screen.getByLabelText("Quantity"), { target: { value: "voltage" } });
    expect(node(s, "cap-measure")).toMatchObject({ quantity: "voltage", unit: "V" });
    expect((screen.getByLabelText("Unit") as HTMLInputElement).value).toBe("V");
    type("Unit", "mV");
    fireEvent.change(screen.getByLabelText("Quantity"), { target: { value: "voltage" } });
    expect(node(s, "cap-measure")).toMatchObject({ unit: "mV" });
    fireEvent.change(screen.getByLabelText("Quantity"), { target: { value: "capacitance" } });
    expect(node(s, "cap-measure")).toMatchObject({ quantity: "capacitance", unit: "µF" });
  });

  it("switching to 'at least' keeps the value and offers only the verdicts those limits can give", () => {
    const s = mount(smallTree(), "cap-measure");
    fireEvent.change(screen.getByLabelText("Limits"), { target: { value: "atLeast" } });
    const m = node(s, "cap-measure");
    expect(m.kind === "measurement" && m.limits).toEqual({ kind: "atLeast", min: { value: 1.5 } });
    const branches = screen.getByRole("group", { name: "Where each verdict leads" });
    expect(within(branches).getByLabelText("On a low reading, go to")).toBeTruthy();
    expect(within(branches).getByLabelText("On a within reading, go to")).toBeTruthy();
    // The old 'high' branch is still listed, marked as never taken, so it can be disconnected.
    expect(within(branches).getByText("These limits never give this verdict: disconnect it.")).toBeTruthy();
  });

  it("guarded acceptance with the meter's accuracy makes a near-limit reading marginal in the preview", () => {
    const s = mount(smallTree(), "cap-measure");
    fireEvent.click(screen.getByLabelText(/Take the meter's accuracy into account/));
    type("± percent of the reading", "1");
    type("Plus counts", "2");
    type("Resolution (one count)", "0.01");
    fireEvent.change(screen.getByLabelText("Judging readings near a limit"), { target: { value: "guarded" } });
    expect(node(s, "cap-measure")).toMatchObject({ meter: { percent: 1, counts: 2, resolution: 0.01 }, acceptance: "guarded" });
    type("Sample reading", "1.42");
    // ILAC-G8:09/2019 guarded acceptance, w = U: the preview states the acceptance limit used (engine, issue 10 item 5).
    expect(
      screen.getByText(/1\.42 µF → marginal: below the acceptance limit 1\.444 µF \(the low limit 1\.41 µF \+ the meter's 0\.034 µF\)/),
    ).toBeTruthy();
  });
});

describe("common fields", () => {
  it("an empty title gets the engine's message and the draft keeps the old one", () => {
    const s = mount(smallTree(), "cap-failed");
    type("Root cause", "   ");
    expect(screen.getByText("A title is empty.")).toBeTruthy();
    expect(node(s, "cap-failed").title).toBe("Failed run capacitor");
    type("Root cause", "Open run capacitor ");
    expect(node(s, "cap-failed").title).toBe("Open run capacitor");
  });

  it("changing a node's id checks the pattern and that it is free, then follows every link", () => {
    const s = mount(smallTree(), "cap-failed");
    type("Node id", "Cap Failed");
    fireEvent.click(screen.getByRole("button", { name: "Change id" }));
    expect(screen.getByText(/Ids are lower-case words joined by hyphens/)).toBeTruthy();
    type("Node id", "motor-failed");
    fireEvent.click(screen.getByRole("button", { name: "Change id" }));
    expect(screen.getByText("Another node already has the id ‘motor-failed’.")).toBeTruthy();
    type("Node id", "capacitor-open");
    fireEvent.click(screen.getByRole("button", { name: "Change id" }));
    const q = node(s, "cap-look");
    expect(q.kind === "question" && q.answers[0]).toEqual({ label: "yes", to: "capacitor-open" });
  });

  it("the body has a Markdown preview", () => {
    mount(smallTree(), "cap-measure");
    type("Instructions and notes", "Discharge it **first**.\n\n- meter on µF");
    fireEvent.click(screen.getByRole("button", { name: "Preview" }));
    const preview = screen.getByRole("region", { name: "Instructions and notes as the technician sees it" });
    expect(within(preview).getByText("first").tagName).toBe("STRONG");
    expect(within(preview).getByRole("listitem").textContent).toBe("meter on µF");
  });
});

describe("outcome and question forms", () => {
  it("parts are one per line; blank lines are dropped", () => {
    const s = mount(smallTree(), "motor-failed");
    type("Parts (one per line)", "Fan motor, 208 V\n\n  Motor mounting screws  \n");
    expect(node(s, "motor-failed")).toMatchObject({ parts: ["Fan motor, 208 V", "Motor mounting screws"] });
    type("Remedy", "");
    expect(screen.getByText("The remedy is empty.")).toBeTruthy();
  });

  it("an answer is added with a new node made for it; a repeated answer is refused", () => {
    const s = mount(smallTree(), "cap-look");
    type("Answer text", "can't tell");
    fireEvent.change(screen.getByLabelText("The new answer leads to"), { target: { value: "new:escalate" } });
    fireEvent.click(screen.getByRole("button", { name: "Add answer" }));
    const q = node(s, "cap-look");
    expect(q.kind === "question" && q.answers.map((a) => a.label)).toEqual(["yes", "no", "can't tell"]);
    const made = s.state.tree.nodes.at(-1)!;
    expect(made.kind).toBe("escalate");
    expect(q.kind === "question" && q.answers[2]!.to).toBe(made.id);
    type("Answer text", "yes");
    fireEvent.change(screen.getByLabelText("The new answer leads to"), { target: { value: "motor-failed" } });
    fireEvent.click(screen.getByRole("button", { name: "Add answer" }));
    expect(screen.getByText("There is already an answer ‘yes’.")).toBeTruthy();
  });
});

describe("choosing where a branch leads", () => {
  it("a “New …” option makes nothing until it is confirmed; passing over two of them (as arrow keys do) makes no stray node", () => {
    const s = mount(smallTree(), "cap-measure");
    const before = s.state.tree.nodes.length;
    const low = () => screen.getByLabelText("On a low reading, go to") as HTMLSelectElement;
    fireEvent.change(low(), { target: { value: "new:outcome" } });
    fireEvent.change(low(), { target: { value: "new:step" } });
    expect(s.state.tree.nodes).toHaveLength(before);
    // The select keeps showing the choice, and a confirmation says what will happen.
    expect(low().value).toBe("new:step");
    expect(screen.getByText("A new step will be made, and the Low branch connected to it.")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Cancel" }));
    expect(s.state.tree.nodes).toHaveLength(before);
    expect(low().value).toBe("cap-failed");
    fireEvent.change(low(), { target: { value: "new:outcome" } });
    fireEvent.click(screen.getByRole("button", { name: "Make it and connect" }));
    expect(s.state.tree.nodes).toHaveLength(before + 1);
    const made = s.state.tree.nodes.at(-1)!;
    expect(made).toMatchObject({ kind: "outcome", title: "New root cause" });
    const m = node(s, "cap-measure");
    expect(m.kind === "measurement" && m.branches.low).toEqual({ to: made.id });
    expect(low().value).toBe(made.id);
  });

  it("two nodes with the same title are told apart in the list (issue 10 item 11): kind, title and id", () => {
    const t = smallTree();
    const twin = t.nodes.find((n) => n.id === "motor-failed")!;
    twin.title = "Failed run capacitor";
    mount(t, "cap-measure");
    const low = screen.getByLabelText("On a low reading, go to") as HTMLSelectElement;
    const options = [...low.querySelectorAll("optgroup[label='Nodes in this tree'] option")].map((o) => o.textContent);
    expect(options).toContain("Outcome: Failed run capacitor · cap-failed");
    expect(options).toContain("Outcome: Failed run capacitor · motor-failed");
    expect(new Set(options).size).toBe(options.length);
    expect(options).toContain("Question: Is the run capacitor bulging or leaking?");
  });

  it("the new answer's target keeps a chosen “New …” option on screen, so the next key press does not land on another node", () => {
    const s = mount(smallTree(), "cap-look");
    const target = () => screen.getByLabelText("The new answer leads to") as HTMLSelectElement;
    fireEvent.change(target(), { target: { value: "new:measurement" } });
    expect(target().value).toBe("new:measurement");
    expect(screen.getByText("A new measurement will be made for it.")).toBeTruthy();
    type("Answer text", "can't tell");
    fireEvent.click(screen.getByRole("button", { name: "Add answer" }));
    const q = node(s, "cap-look");
    const made = s.state.tree.nodes.at(-1)!;
    expect(made.kind).toBe("measurement");
    expect(q.kind === "question" && q.answers.at(-1)).toEqual({ label: "can't tell", to: made.id });
    // Nothing links the question to itself.
    expect(q.kind === "question" && q.answers.some((a) => a.to === "cap-look")).toBe(false);
  });
});

describe("deleting a node", () => {
  it("focus goes to the confirmation, back to the button on “Keep it”, and the draft loses the node only when confirmed", () => {
    const s = mount(smallTree(), "motor-failed");
    fireEvent.click(screen.getByRole("button", { name: "Delete this node…" }));
    const group = screen.getByRole("group", { name: "Confirm deleting this node" });
    expect(document.activeElement).toBe(within(group).getByRole("button", { name: "Keep it" }));
    expect(group.getAttribute("aria-describedby")).toBeTruthy();
    fireEvent.click(within(group).getByRole("button", { name: "Keep it" }));
    expect(document.activeElement).toBe(screen.getByRole("button", { name: "Delete this node…" }));
    expect(s.state.tree.nodes.some((n) => n.id === "motor-failed")).toBe(true);
    fireEvent.click(screen.getByRole("button", { name: "Delete this node…" }));
    fireEvent.click(screen.getByRole("button", { name: "Delete node" }));
    expect(s.state.tree.nodes.some((n) => n.id === "motor-failed")).toBe(false);
  });
});

describe("tree details form", () => {
  it("checks the title and symptom with the engine's tree schema", () => {
    const s = mount(smallTree(), null);
    type("Symptom the customer reports", "");
    expect(screen.getByText("The symptom is empty.")).toBeTruthy();
    expect(s.state.tree.symptom).toBe("The convection fan hums but does not turn");
    type("Equipment covered (optional)", "Two-fan rotisseries");
    expect(s.state.tree.equipment).toBe("Two-fan rotisseries");
    type("Equipment covered (optional)", "");
    expect("equipment" in s.state.tree).toBe(false);
  });
});
