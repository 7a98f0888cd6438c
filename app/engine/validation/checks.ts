// The checks of validation that look at one node at a time (units, limits, meters, verdict
// branches, formulas, answers, variables) and at ids; they also collect the branches as edges for
// the graph walks. Findings are written for a lead tech.
import type { Finding, Limits, LimitValue, MeasurementNode, NodeKind, Quantity, Tree, TreeNode } from "../types";
import { QUANTITY_INFO, belowAbsoluteZero, kindNoun, resolveUnit, convertQty } from "../units";
import { compileFormula, isReservedName } from "../formula";
import { possibleVerdicts } from "../limits";
import { branchName, describeNode } from "../graph";
import { DEFAULT_REASON, DEFAULT_REMEDY, isDefaultTitle } from "../defaults";
import { type Add, type Edges, branchAt, slotCount, slotKey } from "./shared";

const KIND_NOUN: Record<NodeKind, string> = {
  question: "question",
  measurement: "measurement",
  step: "step",
  caution: "caution",
  nameplate: "nameplate value",
  outcome: "root cause",
  escalate: "hand-over",
};

const VERDICT_WORD: Record<string, string> = {
  low: "a low reading",
  within: "a reading within limits",
  high: "a high reading",
  marginal: "a marginal reading",
};

function checkUnit(node: TreeNode & { quantity: Quantity; unit: string }, i: number, add: Add): boolean {
  const r = resolveUnit(node.unit, node.quantity);
  const info = QUANTITY_INFO[node.quantity];
  if (!r) {
    add({
      severity: "error",
      code: "unit-unknown",
      nodeId: node.id,
      nodeIndex: i,
      field: "unit",
      message: `${describeNode(node)} uses the unit ‘${node.unit}’, which Cluepath doesn't know: for ${info.noun} use ${info.units.join(", ")}.`,
    });
    return false;
  }
  if (r.kind !== info.kind || (node.quantity === "temperature" && !r.absoluteTemperature)) {
    add({
      severity: "error",
      code: "unit-quantity",
      nodeId: node.id,
      nodeIndex: i,
      field: "unit",
      message: `${describeNode(node)} records ${info.noun}, but its unit ‘${node.unit}’ is ${kindNoun(r.kind)}: use ${info.units.join(", ")}.`,
    });
    return false;
  }
  return true;
}

function limitValues(l: Limits): LimitValue[] {
  return l.kind === "range" ? [l.min, l.max] : l.kind === "atLeast" ? [l.min] : l.kind === "atMost" ? [l.max] : [l.nominal];
}

function checkMeasurement(node: MeasurementNode, i: number, add: Add): void {
  const at = { nodeId: node.id, nodeIndex: i };
  const unitOk = checkUnit(node, i, add);
  const L = node.limits;
  const display = unitOk ? resolveUnit(node.unit, node.quantity)! : null;

  // Units of limit values.
  const belowZero = (v: { value: number; unit?: string }) =>
    add({
      severity: "error",
      code: "below-absolute-zero",
      ...at,
      field: "limits",
      message: `A limit of ${describeNode(node)}, ${describeValue(v, node.unit)}, is below absolute zero.`,
    });
  const fixed: (number | null)[] = [];
  for (const v of limitValues(L)) {
    let x: number | null = null;
    if (v.unit !== undefined) {
      const r = resolveUnit(v.unit, node.quantity);
      if (!r) {
        add({
          severity: "error",
          code: "unit-unknown",
          ...at,
          field: "limits",
          message: `A limit of ${describeNode(node)} is in ‘${v.unit}’, which Cluepath doesn't know.`,
        });
      } else if (display && (r.kind !== display.kind || r.absoluteTemperature !== display.absoluteTemperature)) {
        add({
          severity: "error",
          code: "limit-dimension",
          ...at,
          field: "limits",
          message: `A limit of ${describeNode(node)} is in ${v.unit} (${kindNoun(r.kind)}), but the step measures ${QUANTITY_INFO[node.quantity].noun} in ${node.unit}.`,
        });
      } else if (display && "value" in v) {
        if (belowAbsoluteZero(v.value, r)) belowZero(v);
        else x = convertQty(v.value, r.qty, display.qty);
      }
    } else if ("value" in v) {
      if (display && belowAbsoluteZero(v.value, display)) belowZero(v);
      else x = v.value;
    }
    fixed.push(x);
    if ("formula" in v) checkFormula(v.formula, node, i, "limits", add);
  }

  if (L.kind === "range") {
    const [a, b] = fixed;
    if (a != null && b != null) {
      if (a > b) {
        add({
          severity: "error",
          code: "limits-inverted",
          ...at,
          field: "limits",
          message: `${describeNode(node)} has its minimum above its maximum (${describeValue(L.min, node.unit)} to ${describeValue(L.max, node.unit)}): swap them.`,
        });
      } else if (a === b) {
        add({
          severity: "warning",
          code: "limits-zero-width",
          ...at,
          field: "limits",
          message: `${describeNode(node)} has the same minimum and maximum: no real reading will land exactly on it.`,
        });
      }
    }
  }
  if (L.kind === "nominal") {
    const t = L.tolerance;
    if (t.kind === "percent" || t.kind === "absolute") {
      if (t.plus < 0 || t.minus < 0) {
        add({
          severity: "error",
          code: "negative-tolerance",
          ...at,
          field: "limits",
          message: `${describeNode(node)} has a negative tolerance: write it as a size, like ± 6 % (or +10 % / −5 % when the sides differ).`,
        });
      }
      if (t.kind === "percent" && t.minus > 100) {
        add({
          severity: "warning",
          code: "tolerance-below-zero",
          ...at,
          field: "limits",
          message: `${describeNode(node)} allows more than −100 %, so its lower limit is below zero.`,
        });
      }
      if (t.kind === "percent" && node.quantity === "temperature") {
        add({
          severity: "warning",
          code: "percent-of-temperature",
          ...at,
          field: "limits",
          message: `${describeNode(node)} gives a temperature tolerance in percent, which changes with the scale (°F or °C): write it in degrees, like ± 15 °F.`,
        });
      }
      if (t.kind === "absolute" && t.unit !== undefined) {
        const r = resolveUnit(t.unit, node.quantity, true);
        const d = resolveUnit(node.unit, node.quantity, true);
        if (!r)
          add({
            severity: "error",
            code: "unit-unknown",
            ...at,
            field: "limits",
            message: `The tolerance of ${describeNode(node)} is in ‘${t.unit}’, which Cluepath doesn't know.`,
          });
        else if (d && r.kind !== d.kind) {
          add({
            severity: "error",
            code: "limit-dimension",
            ...at,
            field: "limits",
            message: `The tolerance of ${describeNode(node)} is in ${t.unit} (${kindNoun(r.kind)}), but the step measures ${QUANTITY_INFO[node.quantity].noun}.`,
          });
        }
      }
    }
  }

  // Meter and acceptance.
  const m = node.meter;
  if (m) {
    if (m.percent < 0 || m.counts < 0 || m.resolution <= 0) {
      add({
        severity: "error",
        code: "meter-invalid",
        ...at,
        field: "meter",
        message: `The meter accuracy of ${describeNode(node)} needs a percentage and counts of zero or more and a resolution above zero, like ±(1 % + 3 counts) at 0.1 ${node.unit}.`,
      });
    }
    if (m.unit !== undefined) {
      const r = resolveUnit(m.unit, node.quantity, true);
      if (!r || (display && r.kind !== display.kind)) {
        add({
          severity: "error",
          code: "limit-dimension",
          ...at,
          field: "meter",
          message: `The meter resolution of ${describeNode(node)} is in ‘${m.unit}’, which isn't ${QUANTITY_INFO[node.quantity].noun} unit.`,
        });
      }
    }
  }
  const guarded = node.acceptance === "guarded";
  if (guarded && !m) {
    add({
      severity: "warning",
      code: "guarded-without-meter",
      ...at,
      field: "acceptance",
      message: `${describeNode(node)} uses guarded acceptance but gives no meter accuracy: verdicts stay simple unless the technician enters their meter's accuracy.`,
    });
  }

  // Verdict branches.
  const possible = possibleVerdicts(L, guarded);
  for (const v of possible) {
    if (!node.branches[v]) {
      add({
        severity: "error",
        code: "missing-branch",
        ...at,
        message: `${describeNode(node)} has nowhere to go on ${VERDICT_WORD[v]}: add ‘- ${v} → …’.`,
      });
    }
  }
  for (const v of ["low", "high", "marginal"] as const) {
    if (node.branches[v] && !possible.includes(v)) {
      const why =
        v === "marginal"
          ? "only guarded acceptance gives marginal readings (add ‘- acceptance: guarded’ and a meter)"
          : v === "high"
            ? "‘at least’ limits never read high"
            : "‘at most’ limits never read low";
      add({
        severity: "warning",
        code: "unused-branch",
        ...at,
        field: v,
        message: `${describeNode(node)} has a ‘${v}’ branch that is never taken: ${why}.`,
      });
    }
  }
}

function checkFormula(src: string, node: TreeNode, i: number, field: string, add: Add): void {
  const c = compileFormula(src);
  if (!c.ok) {
    add({
      severity: "error",
      code: c.code === "unknown-function" ? "formula-function" : "formula-syntax",
      nodeId: node.id,
      nodeIndex: i,
      field,
      message: `The formula ‘${src}’ in ${describeNode(node)} can't be used: ${c.message}.`,
    });
  }
}

function describeValue(v: LimitValue, unit: string): string {
  return "formula" in v ? `\`${v.formula}\`` : `${v.value} ${v.unit ?? unit}`;
}

/** A variable's first recording node, with the quantity and unit it is recorded in. */
export interface Definer {
  index: number;
  quantity: Quantity;
  unit: string;
}

export interface NodeChecks {
  /** Node id → index of its first node with that id. */
  index: Map<string, number>;
  /** 1 for a node whose id an earlier node already uses. */
  duplicate: Uint8Array;
  /** Index of the start node, when it exists. */
  start: number | undefined;
  definers: Map<string, Definer>;
  edges: Edges;
  /** Branches to ids no node has, with their findings (graph checks fold what they cut off into them). */
  missing: MissingTarget[];
}

export interface MissingTarget {
  from: number;
  target: string;
  finding: Finding;
}

/**
 * Ids, then per node: kinds, units, limits, branches, variables. Nothing is allocated per node
 * unless there is something to report (names and keys are built only for messages).
 */
export function checkNodes(tree: Tree, add: Add): NodeChecks {
  const nodes = tree.nodes;
  const N = nodes.length;

  // Ids.
  const index = new Map<string, number>();
  const duplicate = new Uint8Array(N);
  for (let i = 0; i < N; i++) {
    const n = nodes[i]!;
    const first = index.get(n.id);
    if (first !== undefined) {
      duplicate[i] = 1;
      add({
        severity: "error",
        code: "duplicate-id",
        nodeId: n.id,
        nodeIndex: i,
        message: `Two steps use the id ‘${n.id}’ (${describeNode(nodes[first]!)} and ${describeNode(n)}): give each its own id.`,
      });
    } else index.set(n.id, i);
  }
  const start = index.get(tree.start);
  if (N === 0) {
    add({ severity: "error", code: "empty-tree", message: "The tree has no steps yet: add a first step." });
  } else if (start === undefined) {
    add({ severity: "error", code: "start-missing", message: `The tree starts at ‘${tree.start}’, but no step has that id.` });
  }

  const definers = new Map<string, Definer>();
  const edges: Edges = { edgeFrom: [], edgeTo: [], edgeLoop: [], edgeSlot: [] };
  const { edgeFrom, edgeTo, edgeLoop, edgeSlot } = edges;

  const missing: MissingTarget[] = [];
  const titled = new Map<string, number>();

  // (Helpers instead of per-node closures: nothing is built per node unless it is reported.)
  const at = (i: number) => ({ nodeId: nodes[i]!.id, nodeIndex: i });
  const nameOf = (i: number) => describeNode(nodes[i]!);
  for (let i = 0; i < N; i++) {
    const n = nodes[i]!;

    // Titles: no editor placeholder left, and each node told apart from the others by its title.
    if (isDefaultTitle(n.title)) {
      add({
        severity: "error",
        code: "default-text",
        ...at(i),
        field: "title",
        message: `${nameOf(i)} still has the editor's placeholder title ‘${n.title}’: say what this ${KIND_NOUN[n.kind]} is.`,
      });
    }
    const same = duplicate[i] ? undefined : titled.get(n.title);
    if (same === undefined) {
      if (!duplicate[i]) titled.set(n.title, i);
    } else if (!isDefaultTitle(n.title)) {
      add({
        severity: "warning",
        code: "duplicate-title",
        ...at(i),
        field: "title",
        message: `‘${n.id}’ and ‘${nodes[same]!.id}’ are both titled ‘${n.title}’: give each its own title, so they can be told apart wherever they are picked (branch lists, the run's history, the report).`,
      });
    }
    if (n.kind === "outcome" && n.remedy === DEFAULT_REMEDY) {
      add({
        severity: "error",
        code: "default-text",
        ...at(i),
        field: "remedy",
        message: `${nameOf(i)} still has the editor's placeholder remedy ‘${DEFAULT_REMEDY}’: write what the technician should do.`,
      });
    }
    if (n.kind === "escalate" && n.reason === DEFAULT_REASON) {
      add({
        severity: "error",
        code: "default-text",
        ...at(i),
        field: "reason",
        message: `${nameOf(i)} still has the editor's placeholder reason ‘${DEFAULT_REASON}’: write why a lead should take over.`,
      });
    }

    switch (n.kind) {
      case "question": {
        if (n.answers.length === 1) {
          add({
            severity: "error",
            code: "too-few-answers",
            ...at(i),
            message: `${nameOf(i)} has only one answer: a question needs two or more (or make it a step).`,
          });
        }
        for (let k = 1; k < n.answers.length; k++) {
          const label = n.answers[k]!.label;
          for (let j = 0; j < k; j++) {
            if (n.answers[j]!.label === label) {
              add({
                severity: "error",
                code: "duplicate-answer",
                ...at(i),
                field: `answer:${label}`,
                message: `${nameOf(i)} lists the answer ‘${label}’ twice.`,
              });
              break;
            }
          }
        }
        break;
      }
      case "measurement":
        checkMeasurement(n, i, add);
        break;
      case "nameplate":
        checkUnit(n, i, add);
        break;
      default:
        break;
    }

    // Variables recorded here.
    if ((n.kind === "measurement" || n.kind === "nameplate") && n.variable !== undefined) {
      const variable = n.variable;
      if (isReservedName(variable)) {
        add({
          severity: "error",
          code: "variable-reserved",
          ...at(i),
          field: "variable",
          message: `${nameOf(i)} records ‘${variable}’, which is the name of a formula function: pick another name.`,
        });
      }
      const prev = definers.get(variable);
      if (!prev) definers.set(variable, { index: i, quantity: n.quantity, unit: n.unit });
      else if (prev.unit !== n.unit || prev.quantity !== n.quantity) {
        add({
          severity: "error",
          code: "variable-units",
          ...at(i),
          field: "variable",
          message: `‘${variable}’ is recorded in ${prev.unit} by ${describeNode(nodes[prev.index]!)} but in ${n.unit} by ${nameOf(i)}: formulas would mix units, so use one unit or two names.`,
        });
      }
    }

    // Branches.
    const count = slotCount(n);
    let any = false;
    for (let slot = 0; slot < count; slot++) {
      const branch = branchAt(n, slot);
      if (!branch) continue;
      any = true;
      const to = index.get(branch.to);
      if (to === undefined) {
        const key = slotKey(n, slot);
        const finding: Finding = {
          severity: "error",
          code: "unknown-target",
          ...at(i),
          field: key,
          message: `${nameOf(i)} sends ‘${branchName(key)}’ to ‘${branch.to}’, but no step has that id.`,
        };
        add(finding);
        missing.push({ from: i, target: branch.to, finding });
      } else {
        edgeFrom.push(i);
        edgeTo.push(to);
        edgeLoop.push(branch.recheck !== undefined);
        edgeSlot.push(slot);
      }
      if (branch.recheck) {
        const r = branch.recheck;
        if (!Number.isInteger(r.max) || r.max < 1) {
          const key = slotKey(n, slot);
          add({
            severity: "error",
            code: "recheck-bound",
            ...at(i),
            field: key,
            message: `The re-check loop on ‘${branchName(key)}’ in ${nameOf(i)} needs a limit of 1 or more times.`,
          });
        }
        if (r.onExceed !== undefined) {
          const ex = index.get(r.onExceed);
          if (ex === undefined) {
            const finding: Finding = {
              severity: "error",
              code: "unknown-target",
              ...at(i),
              field: slotKey(n, slot),
              message: `${nameOf(i)} goes to ‘${r.onExceed}’ when the re-check limit is reached, but no step has that id.`,
            };
            add(finding);
            missing.push({ from: i, target: r.onExceed, finding });
          } else {
            edgeFrom.push(i);
            edgeTo.push(ex);
            edgeLoop.push(false);
            edgeSlot.push(slot);
          }
        }
      }
    }
    if (!any && n.kind !== "outcome" && n.kind !== "escalate") {
      const fix =
        n.kind === "question"
          ? "add answers, each with a next step"
          : n.kind === "measurement"
            ? "add branches for low, within and high"
            : "add a next step or make it an outcome";
      add({ severity: "error", code: "dead-end", ...at(i), message: `${nameOf(i)} has no way on: ${fix}.` });
    }
  }
  return { index, duplicate, start, definers, edges, missing };
}
