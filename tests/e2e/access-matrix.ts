// Who may call each route, written down once. The access test reads every file under server/api
// and fails for a route with no entry here.
//   'ok'      = 2xx: the caller's own crew's real object (tests/e2e/access.test.ts builds it) is served
//   'pass'    = the gate lets the caller through (neither 401 nor 403): routes that name no object
//   'refused' = 403 or 404
//   number    = the exact status expected
// Every caller is in Skerrow Point (the admin in no crew). A route that names an object (an id in the
// path, a crew or deck in the body or query) is called twice per role: with a real object of
// Skerrow Point (the entry's own column) and with the matching real object of Vellan Ness (`other`;
// when left out: 'refused' where the own column is 'ok', else the own column's status).
export type Expect = 'ok' | 'pass' | 'refused' | number
export type Role = 'trainee' | 'instructor' | 'lead' | 'admin'
export interface Entry {
  anon: Expect
  trainee: Expect
  instructor: Expect
  lead: Expect
  admin: Expect
  other?: Partial<Record<Role, Expect>>
}

const anyone: Entry = { anon: 'pass', trainee: 'pass', instructor: 'pass', lead: 'pass', admin: 'pass' }
const signedIn: Entry = { anon: 401, trainee: 'pass', instructor: 'pass', lead: 'pass', admin: 'pass' }
const adminOnly: Entry = { anon: 401, trainee: 403, instructor: 403, lead: 403, admin: 'pass' }
// The rules are server/domain/policy.ts's, one per relation; the entries name the one they follow.
// An admin oversees everything but authors no instructor's content and acts as no lead.
// buildsDeck: a deck's own instructor only; the admin is no instructor. Another crew's deck is not confirmed to exist.
const deckOwner: Entry = { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 403 }
// readsCrewReports: a lead of the crew, an instructor with a deck assigned to it (teachesCrew), an admin (any crew).
const crewReport: Entry = { anon: 401, trainee: 403, instructor: 'ok', lead: 'ok', admin: 'ok', other: { admin: 'ok' } }

export const MATRIX: Record<string, Entry> = {
  'GET /api/decks': signedIn,
  'POST /api/decks': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'GET /api/decks/builder': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  // A published deck: its crew's people and its instructor; another crew's deck is a 404.
  'GET /api/decks/:deck': { anon: 401, trainee: 'ok', instructor: 'ok', lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  'GET /api/decks/:deck/builder': deckOwner,
  'PATCH /api/decks/:deck': deckOwner,
  'DELETE /api/decks/:deck': deckOwner,
  // overseesDeck (requireDeckOverseer): its own instructor, to crews they belong to; an admin, to any crew.
  'PUT /api/decks/:deck/crews': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 'ok', other: { admin: 'ok' } },
  'POST /api/decks/:deck/target-types': deckOwner,
  'POST /api/decks/:deck/views': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 403 },
  'PATCH /api/target-types/:target-type': deckOwner,
  'DELETE /api/target-types/:target-type': deckOwner,
  'DELETE /api/views/:view': deckOwner,
  // The trash of removed views (issue 17, item 4): its deck's owner only.
  'GET /api/decks/:deck/trash': deckOwner,
  'POST /api/views/:view/restore': deckOwner,
  // The instructor's library of target types (issue 17, item 5): their own decks' types, used (linked) in
  // their own deck; a deck's row of a shared type is unlinked by the deck's owner only.
  'GET /api/target-types/library': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'POST /api/decks/:deck/type-links': deckOwner,
  'POST /api/target-types/:target-type/unlink': deckOwner,
  // An upload job is its uploader's only (an instructor's); nobody else learns it exists.
  'GET /api/jobs/:job': { anon: 401, trainee: 404, instructor: 'ok', lead: 404, admin: 404 },
  'POST /api/watches': { anon: 401, trainee: 'ok', instructor: 403, lead: 403, admin: 403 },
  'GET /api/watches/today': { anon: 401, trainee: 'pass', instructor: 403, lead: 403, admin: 403 },
  'GET /api/watches/:watch/pack': { anon: 401, trainee: 'ok', instructor: 403, lead: 403, admin: 403 },
  'POST /api/sightings/:sighting/call': { anon: 401, trainee: 'ok', instructor: 403, lead: 403, admin: 403 },
  'POST /api/sightings/:sighting/void': { anon: 401, trainee: 'ok', instructor: 403, lead: 403, admin: 403 },
  'POST /api/baseline': { anon: 401, trainee: 'pass', instructor: 'pass', lead: 'pass', admin: 'pass' },
  'GET /api/baseline/me': signedIn,
  'GET /api/health': anyone,
  // The catch-all: an /api path that names no route is a JSON 404 for everyone.
  'GET /api/:path': { anon: 404, trainee: 404, instructor: 404, lead: 404, admin: 404 },
  'POST /api/auth/login': anyone,
  'POST /api/auth/logout': signedIn,
  'GET /api/auth/me': signedIn,
  'PATCH /api/auth/me': signedIn,
  // Everyone changes their own password (issue 17, item 3); the empty body is a 400.
  'POST /api/auth/password': signedIn,
  'POST /api/auth/reset-request': anyone,
  'POST /api/auth/reset': anyone,
  // Leads and instructors invite trainees into their own crews; an admin into any crew.
  'POST /api/invites': { anon: 401, trainee: 403, instructor: 'ok', lead: 'ok', admin: 'ok', other: { instructor: 403, lead: 403, admin: 'ok' } },
  'GET /api/invites/preview': anyone,
  // Waiting invitations: listed, sent again and withdrawn by admins (issue 17, item 2).
  'GET /api/invites': adminOnly,
  'POST /api/invites/:invite/resend': { ...adminOnly, admin: 'ok', other: { admin: 'ok' } },
  'DELETE /api/invites/:invite': { ...adminOnly, admin: 'ok', other: { admin: 'ok' } },
  'POST /api/invites/accept': anyone,
  'GET /api/outbox': adminOnly,
  'GET /api/admin/users': adminOnly,
  'PATCH /api/admin/users/:user': { ...adminOnly, admin: 'ok', other: { admin: 'ok' } },
  'GET /api/admin/audit': adminOnly,
  'GET /api/admin/audit/actions': adminOnly,
  // Setting a person's crews (add, move) is an admin's act, like adding a member (issue 17, item 1).
  'PUT /api/admin/users/:user/crews': { ...adminOnly, admin: 'ok', other: { admin: 'ok' } },
  'GET /api/crews': signedIn,
  'POST /api/crews': adminOnly,
  'GET /api/crews/:crew': { anon: 401, trainee: 403, instructor: 'ok', lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  'PATCH /api/crews/:crew': { anon: 401, trainee: 403, instructor: 403, lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  // Adding an existing person to a crew is an admin's act (issue 14, item 8).
  'POST /api/crews/:crew/members': { anon: 401, trainee: 403, instructor: 403, lead: 403, admin: 'ok', other: { admin: 'ok' } },
  'DELETE /api/crews/:crew/members/:user': { anon: 401, trainee: 403, instructor: 403, lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  'GET /api/crews/:crew/stats': crewReport,
  'GET /api/crews/:crew/stats.csv': crewReport,
  'GET /api/crews/:crew/confusions': crewReport,
  // The crew's fitted scheduling parameters: the same people as the crew reports; POST starts a fit.
  'GET /api/crews/:crew/fsrs': crewReport,
  'POST /api/crews/:crew/fsrs': crewReport,
  'GET /api/crews/:crew/scan': { anon: 401, trainee: 403, instructor: 'ok', lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  // overseesDeck: its own instructor or an admin (an admin oversees every deck; the same rule assigns it to crews).
  'GET /api/decks/:deck/confusions': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 'ok', other: { admin: 'ok' } },
  // requirePersonAccess: the person, an admin, an instructor who teaches the person, a lead over the person (crewsLedOver).
  // Own crew's person: the trainee is that person; another crew's person is refused to all but the admin.
  'GET /api/people/:user': { anon: 401, trainee: 'ok', instructor: 'ok', lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  'POST /api/digests/run': adminOnly,
  // A lead's own preview of the next weekly digest (issue 17, item 13).
  'GET /api/digests/preview': { anon: 401, trainee: 403, instructor: 403, lead: 'pass', admin: 403 },
  'GET /api/scan/drills': signedIn,
  'POST /api/scan/drills': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 'pass' },
  'PATCH /api/scan/drills/:drill': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 'ok', other: { admin: 'ok' } },
  'PUT /api/scan/drills/:drill/crews': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 'ok', other: { admin: 'ok' } },
  // seesScanPasses: own passes; a lead's or instructor's crew member's; anyone's for an admin.
  'GET /api/scan/passes': { anon: 401, trainee: 'ok', instructor: 'ok', lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  'POST /api/scan/passes': signedIn,
  'POST /api/scan/passes/start': signedIn,
  'GET /api/checks': signedIn,
  'POST /api/checks': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 403 },
  'GET /api/checks/:check': { anon: 401, trainee: 'ok', instructor: 'ok', lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  'PATCH /api/checks/:check': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 403 },
  'DELETE /api/checks/:check': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 403 },
  // Retiring a check (issue 17, item 7): its own instructor only.
  'POST /api/checks/:check/retire': { anon: 401, trainee: 403, instructor: 'ok', lead: 403, admin: 403 },
  'POST /api/checks/:check/attempts': { anon: 401, trainee: 'ok', instructor: 403, lead: 403, admin: 403 },
  // A result: the trainee, a lead of the crew the check belongs to, the check's instructor, an admin.
  'GET /api/checks/attempts/:attempt': { anon: 401, trainee: 'ok', instructor: 'ok', lead: 'ok', admin: 'ok', other: { admin: 'ok' } },
  'POST /api/checks/attempts/:attempt/finish': { anon: 401, trainee: 'ok', instructor: 403, lead: 403, admin: 403 },
  'POST /api/checks/attempts/:attempt/reset': { anon: 401, trainee: 403, instructor: 403, lead: 'ok', admin: 403 },
  'POST /api/checks/attempts/:attempt/sign-off': { anon: 401, trainee: 403, instructor: 403, lead: 'ok', admin: 403 },
  // Withdrawing a sign-off: the same lead rule; the attempt is signed off first (issue 17, item 11).
  'POST /api/checks/attempts/:attempt/withdraw-sign-off': { anon: 401, trainee: 403, instructor: 403, lead: 'ok', admin: 403 },
}
