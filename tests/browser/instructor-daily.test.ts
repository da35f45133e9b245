// The instructor's daily work at desktop size (issue 17): checks with a due date, changed before
// anyone takes them and retired after, each step asserted in the database.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { DESKTOP, PHONE, launch, newPage, shot, signIn } from '../support/browser'
import { drillTrainee, ensureWatchFixture, readDb } from '../support/watch-fixture'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

const checkRow = (title: string) => readDb(db => db.prepare('SELECT id, due_at AS dueAt, retired_at AS retiredAt, pass_mark AS passMark FROM checks WHERE title = ?')
  .get(title) as { id: string, dueAt: number | null, retiredAt: number | null, passMark: number } | undefined)

describe('checks (issue 17, item 7)', () => {
  it('defines a check with a due date, changes it before anyone takes it, and retires it after, asking first', async () => {
    const fx = await ensureWatchFixture()
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'instructor@glint.demo')
    await page.goto('/checks')
    const form = page.getByTestId('check-form')
    const deckTitle = readDb(db => db.prepare('SELECT title FROM decks WHERE id = ?').pluck().get(fx.deckId)) as string
    await form.getByLabel('Deck').selectOption({ label: deckTitle })
    await expect.poll(() => form.getByRole('checkbox', { name: 'beam' }).count()).toBe(1)
    const title = `Dawn watch check ${Date.now().toString(36)}`
    await form.getByLabel('Title').fill(title)
    // An ISO 8601 date, as <input type="date"> holds it (HTML, "valid date string").
    const due = new Date(Date.now() + 10 * 86_400_000).toISOString().slice(0, 10)
    await form.getByLabel('Due date (optional)').fill(due)
    await form.getByRole('button', { name: 'Define the check' }).click()
    const item = page.getByTestId('defined-check').filter({ hasText: title })
    await item.waitFor()
    expect(checkRow(title)?.dueAt).toBe(Date.parse(`${due}T23:59:59.999Z`))
    expect(await item.textContent()).toContain('Due by')

    // Nobody took it yet: it can be changed in place.
    await item.getByRole('button', { name: `Change ${title}` }).click()
    const edit = page.getByTestId('check-form')
    await edit.getByLabel('Pass mark (%)').fill('85')
    await shot(page, 'checks-change')
    await edit.getByRole('button', { name: 'Save the check' }).click()
    await expect.poll(() => checkRow(title)?.passMark).toBe(0.85)

    // Taken once, it can no longer be changed or deleted, only retired.
    const trainee = await drillTrainee(fx.crewId)
    const started = await trainee.client.post(`/api/checks/${checkRow(title)!.id}/attempts`)
    expect(started.status, started.text).toBe(201)
    await page.reload()
    await item.waitFor()
    expect(await item.getByRole('button', { name: `Change ${title}` }).count()).toBe(0)
    expect(await item.getByRole('button', { name: `Delete ${title}` }).count()).toBe(0)
    await item.getByRole('button', { name: `Retire ${title}` }).click()
    const dialog = page.getByRole('dialog', { name: `Retire ${title}?` })
    await dialog.waitFor()
    expect(await dialog.textContent()).toContain('keep their results')
    await shot(page, 'checks-retire-confirm')
    await dialog.getByRole('button', { name: 'Retire the check' }).click()
    await expect.poll(() => checkRow(title)?.retiredAt ?? null).not.toBeNull()
    await expect.poll(() => item.textContent()).toContain('Retired')
    await shot(page, 'checks-instructor')
    await context.close()
  })
})

describe('from confusions to teaching (issue 17, item 6)', () => {
  it('shows the worst pairs side by side with their pictures and features, and makes a short check of them in one click', async () => {
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'instructor@glint.demo')
    const deck = readDb(db => db.prepare(`SELECT d.id FROM decks d JOIN users u ON u.id = d.owner_id WHERE u.email = 'instructor@glint.demo' AND d.status = 'published' ORDER BY d.title`).pluck().get()) as string
    await page.goto(`/confusions/${deck}`)
    await page.getByLabel('Period').selectOption('365')
    const pairs = page.getByTestId('side-by-side')
    await expect.poll(() => pairs.count()).toBeGreaterThan(0)
    const first = pairs.first()
    // Two types, each with its picture loaded and its features listed.
    expect(await first.getByRole('heading', { level: 3 }).count()).toBe(2)
    await expect.poll(() => first.evaluate(el => [...el.querySelectorAll('img')].filter(i => i.complete && i.naturalWidth > 0).length)).toBe(2)
    expect(await first.locator('dt').count()).toBeGreaterThan(1)
    await first.scrollIntoViewIfNeeded()
    await shot(page, 'confusions-side-by-side')
    const before = readDb(db => db.prepare('SELECT count(*) FROM checks WHERE deck_id = ?').pluck().get(deck)) as number
    await page.getByRole('button', { name: 'Make a short check of these pairs' }).click()
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Defined' }).count()).toBe(1)
    const made = readDb(db => db.prepare('SELECT target_type_ids AS ids, sighting_count AS n FROM checks WHERE deck_id = ? ORDER BY created_at DESC LIMIT 1').get(deck) as { ids: string, n: number })
    expect(readDb(db => db.prepare('SELECT count(*) FROM checks WHERE deck_id = ?').pluck().get(deck))).toBe(before + 1)
    const shownNames = await pairs.getByRole('heading', { level: 3 }).allTextContents()
    const storedNames = readDb(db => (JSON.parse(made.ids) as string[]).map(id => db.prepare('SELECT name FROM target_types WHERE id = ?').pluck().get(id) as string))
    expect(new Set(storedNames)).toEqual(new Set(shownNames.map(n => n.trim())))
    expect(made.n).toBe(10)
    await context.close()
  })
})

describe('the changed instructor screens at 390x844', () => {
  it('fit the phone without sideways scrolling (WCAG 2.2 SC 1.4.10 Reflow: 320 CSS px, no two-dimensional scrolling)', async () => {
    const { context, page } = await newPage(browser, PHONE)
    await signIn(page, 'instructor@glint.demo')
    const deck = readDb(db => db.prepare(`SELECT d.id FROM decks d JOIN users u ON u.id = d.owner_id WHERE u.email = 'instructor@glint.demo' AND d.status = 'published' ORDER BY d.title`).pluck().get()) as string
    for (const [path, name] of [[`/decks/${deck}`, 'decks-builder-phone'], ['/checks', 'checks-instructor-phone'], [`/confusions/${deck}`, 'confusions-side-by-side-phone']] as const) {
      await page.goto(path)
      await page.waitForLoadState('networkidle')
      expect(await page.evaluate(() => document.documentElement.scrollWidth), path).toBeLessThanOrEqual(PHONE.width)
      await shot(page, name)
    }
    await context.close()
  })
})

describe('the library of target types (issue 17, item 5)', () => {
  it('uses a type from another own deck, linked: "Shared with" on both, an edit reaches both, a view goes from one deck only, and the deck stops sharing', async () => {
    // Desktop size for an instructor, as the brief for this item asks (1280x800), at a local
    // noon so that the "auto" theme is the day one and the screenshots read well (IANA's Etc/GMT
    // zones carry the opposite sign: Etc/GMT-2 is UTC+2).
    const offset = ((12 - new Date().getUTCHours() + 36) % 24) - 12
    const context = await browser.newContext({
      viewport: { width: 1280, height: 800 }, baseURL: inject('baseUrl'), timezoneId: offset === 0 ? 'Etc/GMT' : `Etc/GMT${offset > 0 ? '-' : '+'}${Math.abs(offset)}`,
    })
    const page = await context.newPage()
    await signIn(page, 'instructor@glint.demo')
    await page.goto('/decks')
    const title = `Library trial ${Date.now().toString(36)}`
    await page.getByLabel('Title').fill(title)
    await page.getByRole('button', { name: 'Create the deck' }).click()
    await page.waitForURL(/\/decks\/[\w-]{8,}$/)
    await page.getByRole('heading', { level: 1, name: title }).waitFor()
    const deckId = page.url().split('/').pop()!
    const source = readDb(db => db.prepare(`SELECT t.id, t.definition_id AS definitionId, t.size_m AS sizeM, d.title, (SELECT count(*) FROM views v WHERE v.target_type_id = t.id) AS n
      FROM target_types t JOIN decks d ON d.id = t.deck_id JOIN users u ON u.id = d.owner_id
      WHERE t.name = 'Taskavel' AND u.email = 'instructor@glint.demo' ORDER BY t.created_at LIMIT 1`).get() as { id: string, definitionId: string, sizeM: number, title: string, n: number })
    const users = readDb(db => db.prepare(`SELECT d.title FROM target_types t JOIN decks d ON d.id = t.deck_id WHERE t.definition_id = ? ORDER BY d.title`).pluck().all(source.definitionId) as string[])
    // The library names the decks that already use the type, and how many.
    const option = page.locator('#link-type option', { hasText: /^\s*Taskavel ·/ })
    expect((await option.textContent())?.trim()).toBe(`Taskavel · used in ${users.length} deck${users.length === 1 ? '' : 's'} (${users.join(', ')}) · ${source.n} views`)
    await page.getByLabel('Target type', { exact: true }).selectOption(await option.getAttribute('value'))
    await shot(page, 'decks-library-link')
    await page.getByRole('button', { name: 'Use in this deck' }).click()
    const card = page.getByRole('article', { name: 'Taskavel' })
    await card.waitFor()
    await expect.poll(() => card.getByRole('list', { name: /^Taskavel, .*, in six conditions$/ }).count()).toBe(source.n)
    expect(await card.getByTestId('shared-with').textContent()).toBe(`Shared with: ${users.join(', ')}`)
    const linked = readDb(db => db.prepare('SELECT id, definition_id AS definitionId FROM target_types WHERE deck_id = ?').get(deckId) as { id: string, definitionId: string })
    expect(linked.definitionId).toBe(source.definitionId)
    const filesOf = (typeId: string) => readDb(db => db.prepare(`SELECT x.file FROM variants x JOIN views v ON v.id = x.view_id WHERE v.target_type_id = ? ORDER BY x.file`).pluck().all(typeId) as string[])
    const originals = filesOf(source.id)
    expect(filesOf(linked.id)).toEqual(originals)

    // An edit here reaches the source deck's row.
    await card.getByText('Name, size, features and look-alikes').click()
    await card.getByLabel('Span (m)').fill('23.5')
    await card.getByRole('button', { name: 'Save the target type' }).click()
    await card.getByText('Saved here and in the other deck that shares it.').or(card.getByText(/Saved here and in the \d+ other decks that share it\./)).waitFor()
    const sizeOf = (id: string) => readDb(db => db.prepare('SELECT size_m FROM target_types WHERE id = ?').pluck().get(id)) as number
    expect([sizeOf(source.id), sizeOf(linked.id)]).toEqual([23.5, 23.5])
    await shot(page, 'decks-builder-shared')

    // A view goes from this deck only: the dialog says what each choice does.
    await card.getByRole('button', { name: 'Remove this view' }).first().click()
    const dialog = page.getByRole('dialog', { name: /^Remove the .* view of Taskavel\?$/ })
    await dialog.waitFor()
    expect(await dialog.textContent()).toContain(`From this deck only: it leaves this deck's watches at once; ${users.join(', ')} keep it.`)
    await shot(page, 'decks-remove-shared-view')
    await dialog.getByRole('button', { name: 'Remove from this deck only' }).click()
    await expect.poll(() => readDb(db => db.prepare('SELECT count(*) FROM views WHERE target_type_id = ?').pluck().get(linked.id))).toBe(source.n - 1)
    expect(readDb(db => db.prepare('SELECT count(*) FROM views WHERE target_type_id = ?').pluck().get(source.id))).toBe(source.n)
    await page.getByTestId('removed-view').filter({ hasText: 'Taskavel' }).waitFor()

    // The deck stops sharing: its row is its own definition, and the line is gone.
    await card.getByRole('button', { name: 'Stop sharing in this deck' }).click()
    await page.getByRole('dialog', { name: 'Stop sharing Taskavel in this deck?' }).getByRole('button', { name: 'Stop sharing', exact: true }).click()
    await card.getByTestId('shared-with').waitFor({ state: 'detached' })
    expect(readDb(db => db.prepare('SELECT definition_id FROM target_types WHERE id = ?').pluck().get(linked.id))).toBe(linked.id)
    expect(readDb(db => db.prepare('SELECT definition_id FROM target_types WHERE id = ?').pluck().get(source.id))).toBe(source.definitionId)

    // The source deck's size as it was, then this deck goes; the original's pictures stay.
    const put = await page.request.patch(`/api/target-types/${source.id}`, { data: { sizeM: source.sizeM }, headers: { origin: new URL(page.url()).origin } })
    expect(put.status()).toBe(200)
    await page.getByRole('button', { name: 'Delete' }).click()
    await page.getByRole('dialog', { name: 'Delete this deck?' }).getByRole('button', { name: 'Delete the deck' }).click()
    await page.waitForURL(/\/decks$/)
    for (const f of originals.slice(0, 3)) expect((await page.request.get(`/images/${f}`)).status(), f).toBe(200)
    await context.close()
  })
})
