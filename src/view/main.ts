/** Entry of the browser app. */
import { analyseScheme, SPACE_OPERATORS, TIME_INTEGRATORS } from '../stability/index.js';
import { App } from './app.js';
import type { SchemeCatalogue, SchemeChoice } from './panels/settings.js';

/**
 * Courant numbers of integrator × space pairs from the scheme analysis, cached; the options they
 * give are those of the CLI's --time/--space, so exports match the CLI's bytes.
 */
function schemeCatalogue(): SchemeCatalogue {
  const cache = new Map<string, SchemeChoice>();
  return {
    integrators: TIME_INTEGRATORS.map((id) => ({ id, label: id })),
    spaces: SPACE_OPERATORS.map((id) => ({ id, label: id })),
    courant(time, space) {
      const key = `${time}|${space}`;
      let r = cache.get(key);
      if (!r) {
        try {
          const s = analyseScheme(time, space);
          if (s.status === 'stable' && s.courant > 0) {
            const courant = Number(s.courant.toPrecision(12));
            r = { courant, note: `largest stable Courant number of ${s.time} × ${s.space} (von Neumann): ${Number(courant.toPrecision(6))}`, source: `von Neumann analysis of ${s.time} × ${s.space}` };
            if (s.diffusion > 0) r.diffusionScale = 2 * s.diffusion;
          } else {
            r = { courant: null, note: `${time} × ${space} is ${s.status === 'weakly-unstable' ? 'weakly unstable (no positive Courant number is safe)' : 'unstable'}` };
          }
        } catch (e) {
          r = { courant: null, note: e instanceof Error ? e.message : String(e) };
        }
        cache.set(key, r);
      }
      return r;
    },
  };
}

const app = new App(schemeCatalogue());
(window as unknown as { steplens: App }).steplens = app;
void app.start();
