import type { ReflectionTable } from '../core';
import { formatFloat32 } from '../io';
import type { ExportDelimiter, LabProfile } from './lab-profile';

const SEPARATOR: Record<ExportDelimiter, string> = { space: ' ', comma: ',', tab: '\t' };

/**
 * The lab's text export of a reflection table: `#` comment lines, a header row
 * with the profile's column names, then h, k, l, I, sigma per row, separated as
 * the profile says (or as `delimiter` overrides). Values use the shortest
 * decimal that reads back as the same Float32, so nothing changes on reading.
 */
export function formatReflectionText(table: ReflectionTable, profile: LabProfile, delimiter: ExportDelimiter = profile.textExport.delimiter, comments: readonly string[] = []): string {
  const sep = SEPARATOR[delimiter];
  const c = profile.textExport.columns;
  const out: string[] = comments.map((t) => '# ' + t.replace(/[\r\n]+/g, ' '));
  out.push(`# written by Lacuna with the column names of the profile '${profile.name.replace(/[\r\n]+/g, ' ')}'; intensities on the F^2 scale`);
  out.push([c.h, c.k, c.l, c.intensity, c.sigma].join(sep));
  const { h, k, l, i, sigma } = table;
  for (let j = 0; j < table.n; j++) out.push(`${h[j]}${sep}${k[j]}${sep}${l[j]}${sep}${formatFloat32(i[j])}${sep}${formatFloat32(sigma[j])}`);
  return out.join('\n') + '\n';
}
