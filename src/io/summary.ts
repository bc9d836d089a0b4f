/** The JSON summary (the CLI's --json output): the contract other tools rely on. */
import type { AuditResult } from '../audit/audit.js';
import { toJson } from './format.js';

export function summaryJson(r: AuditResult): string {
  return toJson(r.summary);
}
