import type { Me, Role } from '#shared/types/roles'

export interface HomeCard { title: string, text: string, to: string, action: string, primary?: boolean }

// Cards on the home page for a person's roles; each links to a page that exists.
export function homeCardsFor(me: Me | null, _has: (...r: Role[]) => boolean): HomeCard[] {
  if (!me) return []
  const cards: HomeCard[] = []
  if (_has('trainee')) cards.push({ title: 'Today\'s watch', text: watchCardText(useWatchToday().today.value, useDates().relative), to: '/watch', action: 'Start watch', primary: true })
  if (_has('trainee')) cards.push({ title: 'Scan drill', text: 'Search a sector in steps through the binocular field and report what you find.', to: '/scan', action: 'Start a scan' })
  if (_has('instructor')) cards.push({ title: 'Decks', text: 'Build decks of target types: upload silhouettes, check them in every light, publish and assign them to your crews.', to: '/decks', action: 'Open the deck builder', primary: !_has('trainee') })
  if (_has('trainee')) cards.push({ title: 'Your progress', text: 'Your recognition speed and accuracy over time, what you mix up, and what is missing to be ready.', to: '/people/me', action: 'See your progress' })
  if (_has('instructor')) cards.push({ title: 'Confusions', text: 'Which look-alikes your crews mix up in your decks, by aspect and condition.', to: '/confusions', action: 'See the worst pairs' })
  if (_has('instructor', 'admin')) cards.push({ title: 'Scan drills', text: 'Set sectors, fields, steps and contacts for your crews\' scan drills.', to: '/scan/drills', action: 'Set up scan drills' })
  if (_has('trainee')) cards.push({ title: 'Checks', text: 'Qualification checks set for your crew: timed, taken once, with your score at the end.', to: '/checks', action: 'See your checks' })
  else if (_has('instructor', 'lead')) cards.push({ title: 'Checks', text: _has('lead') ? 'Your crews\' check results: sign them off, or reset an attempt to let it be taken again.' : 'Define qualification checks on your decks: sightings, fixed exposure, conditions, aspects and a pass mark.', to: '/checks', action: 'Open checks' })
  return cards
}
