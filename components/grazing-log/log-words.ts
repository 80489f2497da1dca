import { formatNumber } from '@/lib/format';
import type { LogEntryView } from '@/lib/schemas/contract';

// How the log names its entries on screen; the PDF renderer words its own lines the same way.

type EntryFacts = Pick<LogEntryView, 'kind' | 'change' | 'count' | 'paddock' | 'residualHeightIn' | 'takenPct' | 'trampledPct' | 'bareGroundPct' | 'waterChecked' | 'fenceChecked' | 'losses'>;

export function entryTitle(e: Pick<LogEntryView, 'kind' | 'change'>): string {
  if (e.kind === 'move') return (e.change ?? 0) >= 0 ? 'Animals in' : 'Animals out';
  return e.kind === 'tally' ? 'Daily tally' : 'Observation';
}

/** "600 head · Rows 1–20", "residual 3 in · 40 % taken · water checked". */
export function entryDetail(e: EntryFacts): string {
  const parts: string[] = [];
  if (e.kind === 'move' && e.change != null) parts.push(`${formatNumber(Math.abs(e.change))} head`);
  if (e.kind === 'tally' && e.count != null) parts.push(`${formatNumber(e.count)} head counted`);
  if (e.residualHeightIn != null) parts.push(`residual ${formatNumber(e.residualHeightIn, 1)} in`);
  if (e.takenPct != null) parts.push(`${formatNumber(e.takenPct)} % taken`);
  if (e.trampledPct != null) parts.push(`${formatNumber(e.trampledPct)} % trampled`);
  if (e.bareGroundPct != null) parts.push(`${formatNumber(e.bareGroundPct)} % bare ground`);
  if (e.waterChecked) parts.push('water checked');
  if (e.fenceChecked) parts.push('fence checked');
  if (e.losses != null && e.losses > 0) parts.push(`${formatNumber(e.losses)} lost`);
  if (e.paddock) parts.push(e.paddock);
  return parts.join(' · ');
}
