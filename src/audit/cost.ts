/**
 * What a run costs: steps and cell updates over a simulated duration, at the global limit, at the
 * intended step and with local time stepping, and the wall time from a measured cost per cell update.
 */

export interface RunCostLine {
  /** The step of the finest level (the only step without local time stepping), seconds. */
  dt: number;
  /** Steps of the finest level to cover the duration. */
  steps: number;
  cell_updates: number;
  /** cell_updates × the cost of one cell update (null without --cell-step-cost). */
  wall_time: number | null;
}

export interface RunCost {
  duration: number;
  cell_step_cost: number | null;
  global: RunCostLine | null;
  /** At --dt (stable: false when it is above the limit). */
  intended: (RunCostLine & { stable: boolean }) | null;
  /** Macro steps of the coarsest level used; each updates a level-ℓ cell 2^(top − ℓ) times. */
  lts: (RunCostLine & { macro_dt: number; macro_steps: number }) | null;
  /** Global cell updates over local-stepping cell updates. */
  lts_saving: number | null;
}

function line(dt: number, steps: number, updates: number, cost: number | null): RunCostLine {
  return { dt, steps, cell_updates: updates, wall_time: cost === null ? null : updates * cost };
}

/**
 * `limit`: the global limit (null when nothing limits the step, 0 with degenerate cells);
 * `levelCounts`: cells per local-stepping level (after the neighbour rule), or null.
 */
export function runCost(
  duration: number, nCells: number, limit: number | null, cellStepCost: number | null,
  intended: number | null, levelCounts: readonly number[] | null,
): RunCost {
  const usable = limit !== null && limit > 0;
  const uniform = (dt: number): RunCostLine => {
    const steps = Math.ceil(duration / dt);
    return line(dt, steps, steps * nCells, cellStepCost);
  };
  const global = usable ? uniform(limit) : null;
  const at = intended === null ? null : { ...uniform(intended), stable: limit === null || intended <= limit };
  let lts: RunCost['lts'] = null;
  if (usable && levelCounts) {
    let top = 0;
    levelCounts.forEach((c, l) => { if (c > 0) top = l; });
    const macroDt = limit * 2 ** top;
    const macro = Math.ceil(duration / macroDt);
    let perMacro = 0;
    levelCounts.forEach((c, l) => { perMacro += c * 2 ** (top - l); });
    lts = { ...line(limit, macro * 2 ** top, macro * perMacro, cellStepCost), macro_dt: macroDt, macro_steps: macro };
  }
  return {
    duration,
    cell_step_cost: cellStepCost,
    global,
    intended: at,
    lts,
    lts_saving: global && lts && lts.cell_updates > 0 ? global.cell_updates / lts.cell_updates : null,
  };
}
