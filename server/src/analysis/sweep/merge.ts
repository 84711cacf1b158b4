/**
 * A file's findings with its sweep's: one list, with at most one `limits` finding from the sweep on.
 * When the sweep has several (cut short, and limits met at some points) or the analysis of the file's
 * own values hit a limit too, they become one finding on the sweep line naming each, with the fixes of
 * all (the coarser step first), so a reader sees one finding about limits and not competing ones.
 */
import { diagnostic, type EngineDiagnostic, type Severity } from '../../language/catalogue';
import { sortDiagnostics } from '../front';

const RANK: Record<Severity, number> = { info: 0, warning: 1, error: 2 };

/** `analysis` (the file's own findings) and `sweep` (the sweep's), merged as above; neither list is changed. */
export function mergeSweepFindings(analysis: readonly EngineDiagnostic[], sweep: readonly EngineDiagnostic[]): EngineDiagnostic[] {
  const own = sweep.filter((d) => d.code === 'limits');
  const theirs = analysis.filter((d) => d.code === 'limits');
  if (own.length === 0 || own.length + theirs.length < 2) return sortDiagnostics([...analysis, ...sweep]);
  const head = own[0]!;
  const severity = [...own, ...theirs].map((d) => d.severity).reduce((a, b) => (RANK[b] > RANK[a] ? b : a));
  const ownText = own.map((d) => d.message).join(' ');
  // A limit the sweep's message already states word for word is named, not repeated.
  const fresh = theirs.filter((d) => !ownText.includes(d.message));
  const also =
    theirs.length === 0
      ? ''
      : fresh.length === 0
        ? " The analysis of the file's own values also hit that limit."
        : ` The analysis of the file's own values also hit a limit: ${fresh.map((d) => d.message).join(' ')}`;
  const message = `${ownText}${also}`;
  const fixes = [...own, ...theirs].flatMap((d) => d.fixes ?? []);
  const merged = diagnostic('limits', head.start, head.end, message, { severity, fixes: fixes.length > 0 ? fixes : undefined });
  return sortDiagnostics([...analysis.filter((d) => d.code !== 'limits'), ...sweep.filter((d) => d.code !== 'limits'), merged]);
}
