// Counts in words, for every screen.
const englishPlural = new Intl.PluralRules('en-GB')
/** "1 target type", "2 target types": the noun's number by the CLDR plural rules for English (Intl.PluralRules). */
export function countOf(n: number, singular: string, plural = `${singular}s`): string {
  return `${n} ${englishPlural.select(n) === 'one' ? singular : plural}`
}
