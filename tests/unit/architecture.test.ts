// The layering rules of architecture.md (and issue 16, "What must be shown"), checked on the source
// tree: the import graph is read by dependency-cruiser (a maintained analyser the product does not
// use), the route files' use of the database by their text, since routes reach it through Nitro's
// auto-imports (useDb, useSqlite, tables) that no import statement names.
import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { cruise } from 'dependency-cruiser'
import type { ICruiseResult, IViolation } from 'dependency-cruiser'
import { beforeAll, describe, expect, it } from 'vitest'

// Import cycles allowed among server files: none (issue 16, item 3 broke the one between watches.ts
// and checks.ts with server/domain/calls.ts above both). Any cycle fails.
const KNOWN_CYCLES: string[][] = []

// The driver, the query builder, the schema module, and the auto-imported handles of server/utils/db.ts.
const DATABASE_USE = /from ['"](drizzle-orm[^'"]*|better-sqlite3|[^'"]*server\/database\/[^'"]*)['"]|\b(useDb|useSqlite)\s*\(|\btables\./

const filesUnder = (dir: string): string[] => readdirSync(dir).flatMap((name) => {
  const path = join(dir, name)
  return statSync(path).isDirectory() ? filesUnder(path) : /\.(ts|mts)$/.test(name) ? [path] : []
})

let result: ICruiseResult
beforeAll(async () => {
  const out = await cruise(['server', 'shared'], {
    tsPreCompilationDeps: true,
    exclude: { path: '(^|/)node_modules/' },
    doNotFollow: { path: '(^|/)node_modules/' },
    validate: true,
    ruleSet: {
      forbidden: [
        // architecture.md: server/core is pure (no HTTP framework, no Nitro, no database, no domain layer).
        {
          name: 'core-is-pure', severity: 'error', from: { path: '^server/core/' },
          to: { path: ['^server/(domain|utils|database|api|routes|plugins|middleware|tasks)/', '(^|/)node_modules/(h3|nitropack|nitro|nuxt|drizzle-orm|better-sqlite3)/'] },
        },
        // architecture.md: shared/ runs on both sides and imports nothing from app/ or server/.
        { name: 'shared-stands-alone', severity: 'error', from: { path: '^shared/' }, to: { path: '^(app|server)/' } },
        // The domain step (issue 16, item 1): server/utils is plumbing under the domain, never above it.
        { name: 'plumbing-below-domain', severity: 'error', from: { path: '^server/utils/' }, to: { path: '^server/(domain|api|routes|tasks)/' } },
        { name: 'no-cycle', severity: 'error', from: { path: '^server/' }, to: { circular: true } },
      ],
    },
    tsConfig: { fileName: '.nuxt/tsconfig.server.json' },
  }, {}, {})
  result = out.output as ICruiseResult
}, 60_000)

const violations = (rule: string): IViolation[] => result.summary.violations.filter(v => v.rule.name === rule)
// Aliases a module under shared/ might use for the app or the server, caught even when unresolved.
const APP_OR_SERVER_ALIAS = /^(~|@\/|#app|#server|#imports|nitropack|h3)/

describe('architecture rules on the source tree (architecture.md)', () => {
  it('reads the server and shared source files', () => {
    const expected = [...filesUnder('server'), ...filesUnder('shared')].filter(f => !f.endsWith('.d.ts'))
    const read = new Set(result.modules.map(m => m.source))
    expect(expected.filter(f => !read.has(f))).toEqual([])
  })

  it('server/core imports no domain, framework or database module', () => {
    expect(violations('core-is-pure').map(v => `${v.from} -> ${v.to}`)).toEqual([])
    const unresolvedFramework = result.modules.filter(m => m.source.startsWith('server/core/'))
      .flatMap(m => m.dependencies.filter(d => /^(h3|nitropack|nitro|drizzle-orm|better-sqlite3|#imports|#server)/.test(d.module)).map(d => `${m.source} -> ${d.module}`))
    expect(unresolvedFramework).toEqual([])
  })

  it('shared/ imports nothing from app/ or server/', () => {
    expect(violations('shared-stands-alone').map(v => `${v.from} -> ${v.to}`)).toEqual([])
    const aliased = result.modules.filter(m => m.source.startsWith('shared/'))
      .flatMap(m => m.dependencies.filter(d => APP_OR_SERVER_ALIAS.test(d.module)).map(d => `${m.source} -> ${d.module}`))
    expect(aliased).toEqual([])
  })

  it('server/utils (plumbing) imports nothing of the domain, routes or tasks', () => {
    expect(violations('plumbing-below-domain').map(v => `${v.from} -> ${v.to}`)).toEqual([])
    // the rule itself bites: the domain modules exist and are imported by routes
    expect(result.modules.some(m => m.source.startsWith('server/domain/') && m.dependents.some(d => d.startsWith('server/api/')))).toBe(true)
  })

  it('has no import cycle among server files', () => {
    const known = new Set(KNOWN_CYCLES.map(c => [...c].sort().join(' <-> ')))
    const cycles = violations('no-cycle').map(v => (v.cycle ?? []).map(c => c.name).concat(v.from).filter((x, i, a) => a.indexOf(x) === i).sort().join(' <-> '))
    expect(cycles.filter(c => !known.has(c))).toEqual([])
  })

  // Issue 16, item 4: every route is validate, authorise, call a domain function, return.
  it('no route file reaches the database', () => {
    const routes = [...filesUnder('server/api'), ...filesUnder('server/routes')]
    expect(routes).toContain('server/api/sightings/[id]/call.post.ts')
    expect(routes.filter(f => DATABASE_USE.test(readFileSync(f, 'utf8')))).toEqual([])
  })

  // The checks themselves, on lines written here: each pattern catches what it is meant to.
  it('recognises a route\'s database use by its text', () => {
    expect(DATABASE_USE.test('import { eq } from \'drizzle-orm\'')).toBe(true)
    expect(DATABASE_USE.test('const db = useDb()')).toBe(true)
    expect(DATABASE_USE.test('useDb().select().from(tables.users)')).toBe(true)
    expect(DATABASE_USE.test('return listDecks(actor)')).toBe(false)
  })
})
