import type { Me, Role } from '#shared/types/roles'

export interface HomeCard { title: string, text: string, to: string, action: string, primary?: boolean }

// Cards on the home page for a person's roles; each links to a page that exists.
export function homeCardsFor(me: Me | null, _has: (...r: Role[]) => boolean): HomeCard[] {
  if (!me) return []
  const cards: HomeCard[] = []
  return cards
}
