/** Read-out of one cell: the Cell panel (selection) and the tooltip (pointer). */
import { formatLength, formatNumber, formatSeconds } from '../../cli/units.js';
import { clear, el, facts } from '../dom.js';
import type { CellInfo } from '../protocol.js';

export function cellFacts(c: CellInfo): HTMLDListElement {
  return facts([
    ['type', `${c.type} (nodes ${c.nodes.join(', ')})`],
    ['area', `${formatNumber(c.area)} m²`],
    ['h = 2A/P', formatLength(c.h)],
    ['wave speed λ', `${formatNumber(c.speed)} m/s`],
    ['allowed step', formatSeconds(c.dt)],
    ...(c.courant !== null ? [['Courant number', formatNumber(c.courant)] as [string, string]] : []),
    ['radius ratio', formatNumber(c.radiusRatio)],
    ['angles', `${formatNumber(c.minAngle, 3)}° … ${formatNumber(c.maxAngle, 3)}°`],
    ['aspect ratio', formatNumber(c.aspectRatio)],
    ['cause', c.causeText],
    ['centroid', `${formatNumber(c.centroidX, 10)}, ${formatNumber(c.centroidY, 10)}`],
  ]);
}

export function renderCellPanel(root: HTMLElement, idSlot: HTMLElement, info: CellInfo | null): void {
  clear(root);
  idSlot.textContent = info ? String(info.cell) : '';
  idSlot.dataset.cell = info ? String(info.cell) : '';
  if (!info) {
    root.append(el('p', { class: 'hint', text: 'Click a cell, or pick one from the list.' }));
    return;
  }
  root.append(cellFacts(info));
}

export function renderTooltip(tip: HTMLElement, info: CellInfo | null, x: number, y: number): void {
  if (!info) { tip.hidden = true; return; }
  clear(tip);
  tip.append(el('div', { class: 'tip-title', text: `cell ${info.cell}` }), cellFacts(info));
  tip.hidden = false;
  placeTooltip(tip, x, y);
}

/** Put the tooltip beside the pointer, inside its parent. */
export function placeTooltip(tip: HTMLElement, x: number, y: number): void {
  const parent = tip.parentElement!.getBoundingClientRect();
  tip.style.left = `${Math.max(0, Math.min(x + 16, parent.width - tip.offsetWidth - 4))}px`;
  tip.style.top = `${Math.max(0, Math.min(y + 16, parent.height - tip.offsetHeight - 4))}px`;
}
