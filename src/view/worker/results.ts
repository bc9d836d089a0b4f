/** Display fields and single-cell read-outs taken from an AuditResult (worker side, no DOM). */
import { describeCause, type AuditResult } from '../../audit/audit.js';
import { cellTypeName } from '../../mesh/model.js';
import { causeCategories, encodeField, fieldDef, type FieldId } from '../fields.js';
import type { CellInfo, FieldPayload } from '../protocol.js';

/** The float64 source array of a field, or null when the audit has none (Courant without a step). */
export function fieldSource(result: AuditResult, field: FieldId): ArrayLike<number> | null {
  const g = result.geom;
  switch (field) {
    case 'dt': return result.dt;
    case 'courant': return result.courantAtDt;
    case 'h': return g.inradius;
    case 'speed': return result.speed;
    case 'radiusRatio': return g.radiusRatio;
    case 'minAngle': return g.minAngle;
    case 'cause': return causeCategories(result.cause);
  }
}

export function fieldPayload(result: AuditResult, field: FieldId): FieldPayload {
  const wanted = fieldSource(result, field);
  const src = wanted ?? result.dt;
  const used = wanted ? field : 'dt';
  const { values, min, max } = encodeField(src, fieldDef(used).scale === 'log');
  return { field: used, values, min, max };
}

export function cellInfo(result: AuditResult, i: number): CellInfo {
  const { mesh, geom } = result;
  const nodes: number[] = [];
  for (let k = mesh.cellOffsets[i]!; k < mesh.cellOffsets[i + 1]!; k++) nodes.push(mesh.cellNodes[k]!);
  return {
    cell: i,
    type: cellTypeName(mesh.cellTypes[i]!),
    nodes,
    area: geom.area[i]!,
    perimeter: geom.perimeter[i]!,
    h: geom.inradius[i]!,
    speed: result.speed[i]!,
    dt: result.dt[i]!,
    courant: result.courantAtDt ? result.courantAtDt[i]! : null,
    radiusRatio: geom.radiusRatio[i]!,
    minAngle: geom.minAngle[i]!,
    maxAngle: geom.maxAngle[i]!,
    aspectRatio: geom.aspectRatio[i]!,
    cause: result.cause[i]!,
    causeText: describeCause(result.cause[i]!),
    centroidX: geom.centroidX[i]!,
    centroidY: geom.centroidY[i]!,
  };
}
