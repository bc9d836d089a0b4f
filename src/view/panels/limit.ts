/** The "Step limit" panel: the global limit, where it comes from, counts, and the caution. */
import type { AuditSummary } from '../../audit/audit.js';
import { formatCount, formatNumber, formatSeconds } from '../../cli/units.js';
import { clear, el, facts } from '../dom.js';
import type { MeshPayload } from '../protocol.js';

const MODEL_TEXT: Record<string, string> = {
  advection: 'advection, λ = |u|',
  'shallow-water': 'shallow water, λ = |u| + √(g·H)',
  acoustic: 'acoustic, λ = |u| + c',
};

function cellButton(cell: number, goTo: (cell: number) => void): HTMLButtonElement {
  const b = el('button', { class: 'link', type: 'button', 'data-cell': cell, text: `cell ${cell}` });
  b.addEventListener('click', () => goTo(cell));
  return b;
}

export function renderLimitPanel(root: HTMLElement, s: AuditSummary, mesh: MeshPayload, notes: string[], goTo: (cell: number) => void): void {
  clear(root);
  const lim = s.limit;
  const value = el('div', {
    class: 'limit-value', 'data-role': 'global-limit', 'data-value': lim.dt === null ? 'none' : String(lim.dt),
    title: lim.dt === null ? 'no cell limits the step' : `${lim.dt} s`,
    text: lim.dt === null ? 'no limit' : formatSeconds(lim.dt),
  });
  root.append(el('div', { class: 'limit-head' }, el('span', { class: 'caption', text: 'Largest stable step' }), value));
  if (lim.dt !== null && lim.cell !== null) {
    root.append(el('p', { class: 'limit-why' }, 'Set by ', cellButton(lim.cell, goTo), lim.why ? `: ${lim.why}` : ''));
  }
  const m = s.model;
  const rows: [string, string | Node][] = [];
  const parts = Object.entries(s.limit.parts ?? {});
  if (parts.some(([name]) => name === 'diffusion' || name === 'flux')) {
    for (const [name, part] of parts) {
      rows.push([`${name} limit`, part.dt === null ? 'none' : el('span', {}, `${formatSeconds(part.dt)} at `, cellButton(part.cell ?? 0, goTo))]);
    }
  }
  rows.push(
    ['Courant number', `C = ${formatNumber(lim.courant, 6)}`],
    ['from', lim.courant_source],
    ['Physics', MODEL_TEXT[m.name] ?? m.name],
    ['length', lim.length === 'flux' ? 'exact face flux, C·A / Σ max(u·n, 0)|f|' : 'inscribed, h = 2A/P'],
  );
  if (m.velocity) rows.push(['velocity', m.velocity]);
  if (m.depth) rows.push(['depth', m.depth]);
  if (m.sound_speed) rows.push(['sound speed', m.sound_speed]);
  if (m.diffusivity) rows.push(['diffusivity', m.diffusivity]);
  rows.push(
    ['Mesh', `${formatCount(s.mesh.cells)} cells (${formatCount(s.mesh.types.triangle)} triangles, ${formatCount(s.mesh.types.quad)} quads)`],
    ['', `${formatCount(s.mesh.points)} points · ${s.mesh.format}`],
  );
  if (lim.dt !== null) rows.push(['Near the limit', `${formatCount(s.near_limit.within_2x)} cells within 2×, ${formatCount(s.near_limit.within_10x)} within 10×`]);
  const c = s.counts;
  const counted: [number, string][] = [
    [c.degenerate, 'degenerate'], [c.inverted, 'inverted'], [c.non_convex, 'non-convex'], [c.dry, 'dry'],
    [c.unlimited, 'without a limit'], [c.small, 'small'], [c.poor_shape, 'poor shape'], [c.fast, 'in fast flow'],
  ];
  const some = counted.filter(([n]) => n > 0).map(([n, w]) => `${formatCount(n)} ${w}`);
  if (some.length) rows.push(['Cells', some.join(' · ')]);
  if (s.intended) {
    const it = s.intended;
    rows.push(['Intended step', `${formatSeconds(it.dt)}${it.ratio_to_limit === null ? '' : ` = ${formatNumber(it.ratio_to_limit)}× the limit`}`]);
    rows.push(['', `${formatCount(it.cells_over_courant)} cells over C, largest Courant number ${formatNumber(it.max_courant)}`]);
  }
  root.append(facts(rows));
  const warn = [...notes, ...s.warnings];
  if (warn.length) root.append(el('ul', { class: 'warnings' }, ...warn.map((w) => el('li', { text: w }))));
  root.append(el('p', { class: 'caution', 'data-role': 'caution', text: s.caution }));
  void mesh;
}
