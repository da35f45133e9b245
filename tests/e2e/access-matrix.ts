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
  'GET /api/health': anyone,
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
}
