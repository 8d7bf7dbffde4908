/** Sentences we understand, one or two per rule kind, offered when a sentence cannot be read. */
export const EXAMPLE_RULES: readonly string[] = [
  'No meetings before 10am',
  'No meetings after 5pm',
  'No meetings between noon and 1pm',
  'Prefer meetings in the afternoon',
  'No meetings on Fridays',
  'Keep Tuesday mornings free',
  'No meetings after 5pm Europe/Lisbon time',
  'No meetings on the 24th',
  'No meetings from the 21st to the 2nd',
  'At most 4 meetings per day',
  'At most 3 hours of meetings per day',
  'At least 15 minutes between meetings',
  'At least 24 hours notice',
  'No meetings longer than 45 minutes',
];

const IGNORED = new Set(['no', 'meetings', 'meeting', 'i', 'the', 'a', 'on', 'in', 'at', 'of', 'per', 'my']);

function words(s: string): Set<string> {
  return new Set(
    s
      .toLowerCase()
      .split(/[^a-z0-9]+/)
      .map((w) => w.replace(/s$/, ''))
      .filter((w) => w !== '' && !IGNORED.has(w)),
  );
}

/** Up to three example sentences sharing the most words with `text` (the first three when none do). */
export function suggestFor(text: string): string[] {
  const mine = words(text);
  const scored = EXAMPLE_RULES.map((example, index) => {
    let shared = 0;
    for (const w of words(example)) if (mine.has(w)) shared++;
    return { example, index, shared };
  });
  const hits = scored.filter((s) => s.shared > 0).sort((a, b) => b.shared - a.shared || a.index - b.index);
  return (hits.length > 0 ? hits : scored).slice(0, 3).map((s) => s.example);
}
