// The graph canvas (reactflow 11). Loaded only by the editor, lazily and in the browser, so no
// other page — the runner above all — downloads it. It edits the same draft as the outline:
// drag to move, drag from a branch handle to a node to connect, click to open a node's form.
import { memo, useCallback, useEffect, useMemo, useState, type KeyboardEvent } from "react";
import ReactFlow, {
  applyNodeChanges,
  Background,
  Controls,
  Handle,
  MarkerType,
  Position,
  ReactFlowProvider,
  useReactFlow,
  type Connection,
  type Edge,
  type Node,
  type NodeChange,
  type NodeProps,
} from "reactflow";
import "reactflow/dist/style.css";
import "./canvas.css";
import { announce } from "~/components/Announcer";
import { Field } from "~/components/Field";
import { branchName, nodeBranches } from "~/engine/graph";
import { possibleVerdicts } from "~/engine/limits";
import type { Tree, TreeNode } from "~/engine/types";
import { arrange, completeLayout } from "./arrange";
import { NODE_HEIGHT, NODE_WIDTH } from "./layout";
import type { DraftAction, Layout } from "./draft";
import { KIND_LABEL, KIND_MARK } from "./kinds";
import type { NodeMarks } from "./Outline";

export type CanvasProps = {
  tree: Tree;
  layout: Layout;
  selected: string | null;
  marks: NodeMarks;
  dispatch: (a: DraftAction) => void;
  onOpen: (nodeId: string) => void;
};

type Slot = { key: string; label: string };
type BoxData = { node: TreeNode; slots: Slot[]; start: boolean; errors: number; warnings: number };

const ADD_ANSWER = "add-answer";

/** The branch handles a node offers: its answers (and one to add another), verdicts, or next. */
export function slotsOf(n: TreeNode): Slot[] {
  switch (n.kind) {
    case "question":
      return [...n.answers.map((a) => ({ key: `answer:${a.label}`, label: a.label })), { key: ADD_ANSWER, label: "+ answer" }];
    case "measurement": {
      const possible = possibleVerdicts(n.limits, n.acceptance === "guarded");
      return (["low", "within", "high", "marginal"] as const)
        .filter((v) => possible.includes(v) || n.branches[v])
        .map((v) => ({ key: v, label: v }));
    }
    case "step":
    case "caution":
    case "nameplate":
      return [{ key: "next", label: "next" }];
    default:
      return [];
  }
}

const Box = memo(function Box({ data, selected }: NodeProps<BoxData>) {
  const { node, slots, start, errors, warnings } = data;
  return (
    <div
      className={`rounded-xl border-2 bg-card text-ink shadow-sm ${selected ? "border-copper" : errors ? "border-out" : "border-ink-soft"}`}
      style={{ width: NODE_WIDTH, minHeight: NODE_HEIGHT }}
    >
      <Handle type="target" position={Position.Top} className="!h-3 !w-3 !border-2 !border-card !bg-ink" />
      <div className="flex items-center gap-2 border-b border-rule px-2 py-1 text-sm">
        <span aria-hidden="true" className="inline-flex size-6 items-center justify-center rounded border border-ink text-sm">
          {KIND_MARK[node.kind]}
        </span>
        <span className="font-semibold">{KIND_LABEL[node.kind]}</span>
        {start && <span className="rounded bg-copper-soft px-1 text-xs font-semibold text-copper-dark">first</span>}
        {errors > 0 && (
          <span className="ml-auto rounded bg-out-soft px-1 text-xs font-semibold text-out">
            {errors} error{errors === 1 ? "" : "s"}
          </span>
        )}
        {!errors && warnings > 0 && (
          <span className="ml-auto rounded bg-marginal-soft px-1 text-xs font-semibold text-marginal">
            {warnings} warning{warnings === 1 ? "" : "s"}
          </span>
        )}
      </div>
      <p className="line-clamp-2 px-2 py-1 text-sm leading-snug">{node.title}</p>
      {slots.length > 0 && (
        <div className="flex justify-around gap-1 px-1 pb-2 pt-1">
          {slots.map((s) => (
            <div key={s.key} className="relative flex flex-col items-center">
              <span
                className={`max-w-20 truncate rounded px-1 text-xs ${s.key === ADD_ANSWER ? "text-ink-soft" : "bg-paper font-semibold"}`}
              >
                {s.label}
              </span>
              <Handle
                id={s.key}
                type="source"
                position={Position.Bottom}
                className="!-bottom-3 !h-3 !w-3 !border-2 !border-card !bg-copper"
                title={`Drag to connect ‘${s.label}’`}
              />
            </div>
          ))}
        </div>
      )}
    </div>
  );
});

const nodeTypes = { box: Box };

function Flow({ tree, layout, selected, marks, dispatch, onOpen }: CanvasProps) {
  const flow = useReactFlow();
  const placed = useMemo(() => completeLayout(tree, layout), [tree, layout]);
  const derived = useMemo<Node<BoxData>[]>(
    () =>
      tree.nodes.map((n) => ({
        id: n.id,
        type: "box",
        position: placed[n.id] ?? { x: 0, y: 0 },
        selected: n.id === selected,
        // No aria-label: the box's name is its visible text (kind, marks, title, branches), so what
        // a screen reader says is what a sighted user reads (axe: label-content-name-mismatch).
        data: {
          node: n,
          slots: slotsOf(n),
          start: n.id === tree.start,
          errors: marks.get(n.id)?.errors ?? 0,
          warnings: marks.get(n.id)?.warnings ?? 0,
        },
      })),
    [tree, placed, selected, marks],
  );
  const [nodes, setNodes] = useState(derived);
  useEffect(() => setNodes(derived), [derived]);
  const ids = useMemo(() => new Set(tree.nodes.map((n) => n.id)), [tree]);
  const titles = useMemo(() => new Map(tree.nodes.map((n) => [n.id, n.title])), [tree]);
  const edges = useMemo<Edge[]>(
    () =>
      tree.nodes.flatMap((n) =>
        nodeBranches(n)
          .filter(({ branch }) => ids.has(branch.to))
          .map(({ key, branch }) => ({
            id: `${n.id}|${key}`,
            source: n.id,
            sourceHandle: key,
            target: branch.to,
            label: branch.recheck ? `${branchName(key)} (re-check ≤ ${branch.recheck.max})` : branchName(key),
            markerEnd: { type: MarkerType.ArrowClosed },
            style: branch.recheck ? { strokeDasharray: "6 4" } : undefined,
            labelBgPadding: [4, 2] as [number, number],
            labelBgBorderRadius: 4,
            ariaLabel: `Branch ‘${branchName(key)}’ from ‘${n.title}’ to ‘${titles.get(branch.to) ?? branch.to}’`,
          })),
      ),
    [tree, ids, titles],
  );
  const [edgeSelected, setEdgeSelected] = useState<Edge | null>(null);
  const [pendingAnswer, setPendingAnswer] = useState<{ from: string; to: string } | null>(null);

  const onNodesChange = useCallback(
    (changes: NodeChange[]) => {
      setNodes((nds) => applyNodeChanges(changes, nds));
      // A box moved with the arrow keys (selected, focused) is saved like one dragged with the mouse.
      const moved: Layout = {};
      for (const c of changes)
        if (c.type === "position" && c.position && c.dragging === false)
          moved[c.id] = { x: Math.round(c.position.x), y: Math.round(c.position.y) };
      if (Object.keys(moved).length) dispatch({ type: "move", positions: moved });
    },
    [dispatch],
  );
  // Enter or Space on a focused box opens its form, as a click does; on a branch, selects it so it
  // can be disconnected with the button at the top.
  const onKeyDown = (e: KeyboardEvent<HTMLDivElement>) => {
    if (e.key !== "Enter" && e.key !== " ") return;
    const target = e.target as HTMLElement;
    const box = target.closest<HTMLElement>(".react-flow__node");
    if (box?.dataset.id) {
      e.preventDefault();
      onOpen(box.dataset.id);
      return;
    }
    const edgeId = target.closest<SVGElement>(".react-flow__edge")?.dataset.testid?.replace(/^rf__edge-/, "");
    const edge = edges.find((x) => x.id === edgeId);
    if (edge) {
      e.preventDefault();
      setEdgeSelected(edge);
      announce(`Selected ${edge.ariaLabel ?? "the branch"}. “Disconnect” is at the top of the canvas.`);
    }
  };
  const onConnect = useCallback(
    (c: Connection) => {
      if (!c.source || !c.target || !c.sourceHandle) return;
      if (c.sourceHandle === ADD_ANSWER) setPendingAnswer({ from: c.source, to: c.target });
      else dispatch({ type: "set-branch", from: c.source, key: c.sourceHandle, to: c.target });
    },
    [dispatch],
  );
  const rearrange = () => {
    dispatch({ type: "move", positions: arrange(tree) });
    setTimeout(() => flow.fitView({ padding: 0.15, duration: 200 }), 50);
  };

  return (
    <div className="relative h-full min-h-[28rem] w-full" onKeyDown={onKeyDown}>
      <div className="absolute left-2 top-2 z-10 flex flex-wrap gap-2">
        <button type="button" className="btn-quiet min-h-11 px-3 text-base shadow-sm" onClick={rearrange}>
          Arrange automatically
        </button>
        <button
          type="button"
          className="btn-quiet min-h-11 px-3 text-base shadow-sm"
          onClick={() => flow.fitView({ padding: 0.15, duration: 200 })}
        >
          Show all
        </button>
        {edgeSelected && (
          <button
            type="button"
            className="btn-quiet min-h-11 px-3 text-base text-out shadow-sm"
            onClick={() => {
              dispatch({ type: "set-branch", from: edgeSelected.source, key: edgeSelected.sourceHandle!, to: null });
              setEdgeSelected(null);
            }}
          >
            Disconnect ‘{String(edgeSelected.label)}’
          </button>
        )}
      </div>
      {pendingAnswer && <NewAnswer pending={pendingAnswer} tree={tree} dispatch={dispatch} onDone={() => setPendingAnswer(null)} />}
      <ReactFlow
        nodes={nodes}
        edges={edges}
        nodeTypes={nodeTypes}
        onNodesChange={onNodesChange}
        onConnect={onConnect}
        onNodeClick={(_, n) => onOpen(n.id)}
        onNodeDragStop={(_, n) =>
          dispatch({ type: "move", positions: { [n.id]: { x: Math.round(n.position.x), y: Math.round(n.position.y) } } })
        }
        onEdgeClick={(_, e) => setEdgeSelected(e)}
        onPaneClick={() => setEdgeSelected(null)}
        deleteKeyCode={null}
        fitView
        fitViewOptions={{ padding: 0.15 }}
        connectionRadius={36}
        minZoom={0.2}
        proOptions={{ hideAttribution: true }}
      >
        <Background gap={24} color="#d9d4c8" />
        <Controls showInteractive={false} />
      </ReactFlow>
    </div>
  );
}

function NewAnswer({
  pending,
  tree,
  dispatch,
  onDone,
}: {
  pending: { from: string; to: string };
  tree: Tree;
  dispatch: (a: DraftAction) => void;
  onDone: () => void;
}) {
  const [label, setLabel] = useState("");
  const from = tree.nodes.find((n) => n.id === pending.from);
  const to = tree.nodes.find((n) => n.id === pending.to);
  const taken = from?.kind === "question" && from.answers.some((a) => a.label === label.trim());
  return (
    <form
      className="absolute right-2 top-2 z-20 w-72 space-y-2 rounded-xl border border-rule bg-card p-3 shadow-lg"
      aria-label="New answer"
      onSubmit={(e) => {
        e.preventDefault();
        if (!label.trim() || taken) return;
        dispatch({ type: "add-answer", from: pending.from, label: label.trim(), to: pending.to });
        onDone();
      }}
    >
      <p className="text-base">
        A new answer to ‘{from?.title}’, leading to ‘{to?.title}’.
      </p>
      <Field
        label="Answer text"
        name="answer-text"
        autoFocus
        value={label}
        onChange={(e) => setLabel(e.target.value)}
        error={taken ? "That answer is already there." : undefined}
      />
      <div className="flex gap-2">
        <button className="btn-primary min-h-11 px-3 text-base" disabled={!label.trim() || taken}>
          Add answer
        </button>
        <button type="button" className="btn-quiet min-h-11 px-3 text-base" onClick={onDone}>
          Cancel
        </button>
      </div>
    </form>
  );
}

export default function Canvas(props: CanvasProps) {
  return (
    <ReactFlowProvider>
      <Flow {...props} />
    </ReactFlowProvider>
  );
}
