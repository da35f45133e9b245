// Who may call each route, written down once. The access test reads every file under server/api
// and fails for a route with no entry here.
//   'pass'  = the gate lets the caller through (the answer is neither 401 nor 403)
//   number  = the exact status expected
// Routes with `:crew` are called with the caller's own crew and with another crew.
export type Expect = 'pass' | number
export interface Entry {
  anon: Expect
  trainee: Expect
  instructor: Expect
  lead: Expect
  admin: Expect
  // For crew-scoped routes: what each role gets for a crew it is not in (admin sees every crew).
  otherCrew?: Partial<Record<'trainee' | 'instructor' | 'lead' | 'admin', Expect>>
}

const anyone: Entry = { anon: 'pass', trainee: 'pass', instructor: 'pass', lead: 'pass', admin: 'pass' }
const signedIn: Entry = { anon: 401, trainee: 'pass', instructor: 'pass', lead: 'pass', admin: 'pass' }
const adminOnly: Entry = { anon: 401, trainee: 403, instructor: 403, lead: 403, admin: 'pass' }

export const MATRIX: Record<string, Entry> = {
  'GET /api/decks': signedIn,
  'POST /api/decks': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'GET /api/decks/builder': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'GET /api/decks/:deck': signedIn,
  'GET /api/decks/:deck/builder': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'PATCH /api/decks/:deck': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'DELETE /api/decks/:deck': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'PUT /api/decks/:deck/crews': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 'pass' },
  'POST /api/decks/:deck/target-types': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  // The matrix posts JSON; the body middleware refuses a non-multipart upload (415) before any route runs.
  'POST /api/decks/:deck/views': { anon: 415, trainee: 415, instructor: 'pass', lead: 415, admin: 415 },
  'PATCH /api/target-types/:target-type': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'DELETE /api/target-types/:target-type': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'DELETE /api/views/:view': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'GET /api/jobs/:job': signedIn,
  'POST /api/watches': { anon: 401, trainee: 'pass', instructor: 403, lead: 403, admin: 403 },
  'GET /api/watches/today': { anon: 401, trainee: 'pass', instructor: 403, lead: 403, admin: 403 },
  'GET /api/watches/:watch/pack': { anon: 401, trainee: 404, instructor: 403, lead: 403, admin: 403 },
  'POST /api/sightings/:sighting/call': { anon: 401, trainee: 'pass', instructor: 403, lead: 403, admin: 403 },
  'POST /api/sightings/:sighting/void': { anon: 401, trainee: 'pass', instructor: 403, lead: 403, admin: 403 },
  'POST /api/baseline': { anon: 401, trainee: 'pass', instructor: 'pass', lead: 'pass', admin: 'pass' },
  'GET /api/baseline/me': signedIn,
  'GET /api/health': anyone,
  // The catch-all: an /api path that names no route is a JSON 404 for everyone.
  'GET /api/:path': { anon: 404, trainee: 404, instructor: 404, lead: 404, admin: 404 },
  'POST /api/auth/login': anyone,
  'POST /api/auth/logout': signedIn,
  'GET /api/auth/me': signedIn,
  'PATCH /api/auth/me': signedIn,
  'POST /api/auth/reset-request': anyone,
  'POST /api/auth/reset': anyone,
  'POST /api/invites': { anon: 401, trainee: 403, instructor: 'pass', lead: 'pass', admin: 'pass' },
  'GET /api/invites/preview': anyone,
  'POST /api/invites/accept': anyone,
  'GET /api/outbox': adminOnly,
  'GET /api/admin/users': adminOnly,
  'PATCH /api/admin/users/:user': adminOnly,
  'GET /api/admin/audit': adminOnly,
  'GET /api/crews': signedIn,
  'POST /api/crews': adminOnly,
  'GET /api/crews/:crew': {
    anon: 401, trainee: 403, instructor: 'pass', lead: 'pass', admin: 'pass',
    otherCrew: { instructor: 'pass', lead: 403, admin: 'pass' },
  },
  'PATCH /api/crews/:crew': {
    anon: 401, trainee: 403, instructor: 403, lead: 'pass', admin: 'pass',
    otherCrew: { lead: 403, admin: 'pass' },
  },
  'POST /api/crews/:crew/members': {
    anon: 401, trainee: 403, instructor: 403, lead: 'pass', admin: 'pass',
    otherCrew: { lead: 403, admin: 'pass' },
  },
  'DELETE /api/crews/:crew/members/:user': {
    anon: 401, trainee: 403, instructor: 403, lead: 'pass', admin: 'pass',
    otherCrew: { lead: 403, admin: 'pass' },
  },
  // Crew reports: a lead of the crew, an instructor with a deck assigned to it (the demo
  // instructor's decks go to both demo crews), an admin.
  'GET /api/crews/:crew/stats': {
    anon: 401, trainee: 403, instructor: 'pass', lead: 'pass', admin: 'pass',
    otherCrew: { instructor: 'pass', lead: 403, admin: 'pass' },
  },
  'GET /api/crews/:crew/stats.csv': {
    anon: 401, trainee: 403, instructor: 'pass', lead: 'pass', admin: 'pass',
    otherCrew: { instructor: 'pass', lead: 403, admin: 'pass' },
  },
  'GET /api/crews/:crew/confusions': {
    anon: 401, trainee: 403, instructor: 'pass', lead: 'pass', admin: 'pass',
    otherCrew: { instructor: 'pass', lead: 403, admin: 'pass' },
  },
  // The crew's fitted scheduling parameters: the same people as the crew reports; POST starts a fit.
  'GET /api/crews/:crew/fsrs': {
    anon: 401, trainee: 403, instructor: 'pass', lead: 'pass', admin: 'pass',
    otherCrew: { instructor: 'pass', lead: 403, admin: 'pass' },
  },
  'POST /api/crews/:crew/fsrs': {
    anon: 401, trainee: 403, instructor: 'pass', lead: 'pass', admin: 'pass',
    otherCrew: { instructor: 'pass', lead: 403, admin: 'pass' },
  },
  // An unknown deck: 404 to those who could own one, 403 to the rest.
  'GET /api/decks/:deck/confusions': { anon: 401, trainee: 403, instructor: 404, lead: 403, admin: 404 },
  // An unknown person: 404 to the admin only; nobody else learns whether the id exists.
  'GET /api/people/:user': { anon: 401, trainee: 403, instructor: 403, lead: 403, admin: 404 },
  'POST /api/digests/run': adminOnly,
  'GET /api/scan/drills': signedIn,
  'POST /api/scan/drills': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 'pass' },
  'PATCH /api/scan/drills/:drill': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 'pass' },
  'PUT /api/scan/drills/:drill/crews': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 'pass' },
  'GET /api/scan/passes': signedIn,
  'POST /api/scan/passes': signedIn,
  // Checks: an unknown check or attempt is a 404 to every role the route is for.
  'GET /api/checks': signedIn,
  'POST /api/checks': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'GET /api/checks/:check': { anon: 401, trainee: 404, instructor: 404, lead: 404, admin: 404 },
  'PATCH /api/checks/:check': { anon: 401, trainee: 403, instructor: 'pass', lead: 403, admin: 403 },
  'DELETE /api/checks/:check': { anon: 401, trainee: 403, instructor: 404, lead: 403, admin: 403 },
  'POST /api/checks/:check/attempts': { anon: 401, trainee: 404, instructor: 403, lead: 403, admin: 403 },
  'GET /api/checks/attempts/:attempt': { anon: 401, trainee: 404, instructor: 404, lead: 404, admin: 404 },
  'POST /api/checks/attempts/:attempt/finish': { anon: 401, trainee: 404, instructor: 403, lead: 403, admin: 403 },
  'POST /api/checks/attempts/:attempt/reset': { anon: 401, trainee: 403, instructor: 403, lead: 404, admin: 403 },
  'POST /api/checks/attempts/:attempt/sign-off': { anon: 401, trainee: 403, instructor: 403, lead: 404, admin: 403 },
  'GET /api/crews/:crew/scan': {
    anon: 401, trainee: 403, instructor: 'pass', lead: 'pass', admin: 'pass',
    otherCrew: { instructor: 'pass', lead: 403, admin: 'pass' },
  },
}
