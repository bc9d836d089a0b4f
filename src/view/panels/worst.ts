/** The "Tightest cells" list: click or arrow keys move the selection and zoom to the cell. */
import type { WorstCell } from '../../audit/audit.js';
import { formatSeconds } from '../../cli/units.js';
import { clear, el } from '../dom.js';

export class WorstList {
  private rows: HTMLLIElement[] = [];
  private cells: number[] = [];

  constructor(private readonly list: HTMLOListElement, private readonly onPick: (cell: number) => void) {
    list.addEventListener('keydown', (e) => {
      if (e.key !== 'ArrowDown' && e.key !== 'ArrowUp') return;
      e.preventDefault();
      if (this.cells.length === 0) return;
      const cur = this.rows.findIndex((r) => r.classList.contains('active'));
      const next = cur < 0 ? 0 : Math.min(Math.max(cur + (e.key === 'ArrowDown' ? 1 : -1), 0), this.cells.length - 1);
      this.onPick(this.cells[next]!);
      this.rows[next]!.scrollIntoView({ block: 'nearest' });
    });
  }

  render(worst: WorstCell[]): void {
    clear(this.list);
    this.cells = worst.map((w) => w.cell);
    this.rows = worst.map((w, k) => {
      const li = el('li', { 'data-role': 'worst-row', 'data-cell': w.cell, role: 'option', title: w.why },
        el('span', { class: 'rank', text: String(k + 1) }),
        el('span', { class: 'cell', text: `cell ${w.cell}` }),
        el('span', { class: 'dt', text: formatSeconds(w.dt) }),
        el('span', { class: 'cause', text: w.cause.join(', ') || '—' }));
      li.addEventListener('click', () => {
        this.list.focus({ preventScroll: true });
        this.onPick(w.cell);
      });
      return li;
    });
    this.list.append(...this.rows);
    if (worst.length === 0) this.list.append(el('li', { class: 'empty', text: 'No cell limits the step.' }));
  }

  /** Mark the row of `cell` (if listed) as the active one. */
  highlight(cell: number): void {
    this.rows.forEach((r, k) => {
      const on = this.cells[k] === cell;
      r.classList.toggle('active', on);
      r.setAttribute('aria-selected', String(on));
    });
  }
}
