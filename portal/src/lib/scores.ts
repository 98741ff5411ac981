/** Review scores run from 1 (poor) to 5 (excellent); these are the words for each step. */
export const SCORE_WORDS: Record<number, string> = { 1: 'poor', 2: 'fair', 3: 'good', 4: 'very good', 5: 'excellent' };

/** The choices of a score input: the digit to press, the word for a screen reader and a tooltip. */
export const SCORE_OPTIONS = [1, 2, 3, 4, 5].map((value) => ({ value, label: String(value), title: `${value}: ${SCORE_WORDS[value]}` }));

/** A score or a mean of scores, one decimal at most: "4", "3.7". Empty text for none yet. */
export function formatScore(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  return Number(value.toFixed(1)).toLocaleString('en');
}

/** A score with its scale, for reading out of context: "3.7 of 5". */
export function formatScoreOutOf(value: number | null | undefined): string {
  const text = formatScore(value);
  return text ? `${text} of 5` : '';
}
