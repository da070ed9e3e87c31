// A scenario with parameter changes applied (later changes to the same cell and parameter win).
import type { Cell, ParameterChange, Scenario } from "./scenario";
import { validateChanges } from "./validation";

/** Returns a new scenario whose changed cells are copies; unchanged cells and everything else are shared. */
export function applyChanges(scenario: Scenario, changes: readonly ParameterChange[]): Scenario {
  validateChanges(scenario, changes);
  if (changes.length === 0) return scenario;
  const byId = new Map<string, Cell>();
  for (const ch of changes) {
    const current = byId.get(ch.cellId) ?? { ...scenario.cells.find((c) => c.id === ch.cellId)! };
    (current as unknown as Record<string, number | string>)[ch.parameter] = ch.value;
    byId.set(ch.cellId, current);
  }
  return { ...scenario, cells: scenario.cells.map((c) => byId.get(c.id) ?? c) };
}
