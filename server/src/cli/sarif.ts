/**
 * `check --sarif PATH`: the findings as one SARIF 2.1.0 log (OASIS Static Analysis Results Interchange
 * Format, version 2.1.0). One run; its driver lists every diagnostic code of the catalogue as a rule, and
 * every finding is one result whose `ruleId` is the code, with its message and 1-based region.
 * Columns count UTF-16 code units, as the engine's offsets do (`run.columnKind`).
 */
import { isAbsolute, sep } from 'node:path';
import { pathToFileURL } from 'node:url';
import type * as Sarif from 'sarif';
import { CATALOGUE, type Code, type Severity } from '../language/catalogue';
import { escapeJson } from './escape';
import type { FileRecord } from './records';
import type { LocatedDiagnostic } from './render';

/** Where the SARIF 2.1.0 schema is published (the standard's own value for `$schema`). */
export const SARIF_SCHEMA = 'https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json';

const LEVEL: Record<Severity, Sarif.ReportingConfiguration.level> = { error: 'error', warning: 'warning', info: 'note' };
const CODES = Object.keys(CATALOGUE) as Code[];

/** A file name as a URI reference: relative names stay relative (forward slashes), absolute ones become file URLs. */
export function fileUri(file: string): string {
  if (isAbsolute(file)) return pathToFileURL(file).href;
  return file.split(sep).join('/').split('/').map(encodeURIComponent).join('/');
}

function rules(): Sarif.ReportingDescriptor[] {
  return CODES.map((code) => ({
    id: code,
    shortDescription: { text: CATALOGUE[code].about },
    defaultConfiguration: { level: LEVEL[CATALOGUE[code].severity] },
  }));
}

function result(file: string, d: LocatedDiagnostic): Sarif.Result {
  return {
    ruleId: d.code,
    ruleIndex: CODES.indexOf(d.code),
    level: LEVEL[d.severity],
    message: { text: d.message },
    locations: [
      {
        physicalLocation: {
          artifactLocation: { uri: fileUri(file) },
          region: { startLine: d.line, startColumn: d.column, endLine: d.endLine, endColumn: d.endColumn },
        },
      },
    ],
  };
}

/** The SARIF log of one `check` run. */
export function sarifLog(records: readonly FileRecord[]): Sarif.Log {
  return {
    $schema: SARIF_SCHEMA,
    version: '2.1.0',
    runs: [
      {
        tool: { driver: { name: 'eigenspan', rules: rules() } },
        columnKind: 'utf16CodeUnits',
        artifacts: records.map((r) => ({ location: { uri: fileUri(r.file) } })),
        results: records.flatMap((r) => r.findings.map((d) => result(r.file, d))),
      },
    ],
  };
}

/** The SARIF text: JSON with every control and bidirectional character escaped (escape.ts). */
export function renderSarif(records: readonly FileRecord[]): string {
  return escapeJson(JSON.stringify(sarifLog(records), null, 2)) + '\n';
}
