/**
 * A reason or remark of the science core as the page says it: a capital first letter and a
 * full stop, and a lead-in repeated by nested layers said once ("no expected period: no
 * expected period: the given age…" → "No expected period: the given age….").
 */
export function reasonSentence(text: string): string {
  let s = text.trim();
  let previous: string;
  do {
    previous = s;
    s = s.replace(/^([^:]{3,80}):\s*\1:\s*/i, '$1: ');
  } while (s !== previous);
  if (!s) return s;
  const capital = s[0].toUpperCase() + s.slice(1);
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}
