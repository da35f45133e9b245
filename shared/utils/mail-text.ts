// Pieces every mail shares, in the mail transport and in the digests' content.

// The product's safety line, at the foot of every mail (product.md, "Safety").
export const SAFETY_LINE = 'Never look at or near the sun, through binoculars or with the naked eye. Glint is a training aid: it replaces neither qualified instruction nor your unit\'s own rules for standing a look-out watch.'

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' }[c]!))
}
