// Issue 17, items 1 to 3 at desktop size, walked as an admin (and a trainee for their own
// settings) would; each result is read back from the database file or from the screen.
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DESKTOP, PHONE, launch, newPage, shot, signIn } from '../support/browser'
import { Client, linkFromOutbox, signedIn } from '../support/client'
import { TRAINEE_PASSWORD, directPerson, readDb } from '../support/watch-fixture'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

const crewNamed = (name: string) => readDb(db => db.prepare('SELECT id FROM crews WHERE name = ?').pluck().get(name) as string)
const crewsOf = (userId: string) => readDb(db => db.prepare('SELECT crew_id FROM memberships WHERE user_id = ?').pluck().all(userId) as string[])
const nameOf = (userId: string) => readDb(db => db.prepare('SELECT name FROM users WHERE id = ?').pluck().get(userId) as string)

describe('an admin at desktop size (issue 17, items 1 and 2)', () => {
  it('finds a person, adds them to a crew, moves them to another, and reads it in the audit log', async () => {
    const p = await directPerson(['trainee'], null, false)
    const name = nameOf(p.id)
    const [skerrow, vellan] = [crewNamed('Skerrow Point Station'), crewNamed('Vellan Ness Station')]
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'admin@glint.demo')
    await page.goto('/admin')
    // The first page is served with the page itself (server render): 25 a page, the database's count.
    const everyone = readDb(db => db.prepare('SELECT count(*) FROM users').pluck().get() as number)
    await page.getByText(`1–${Math.min(25, everyone)} of ${everyone} people`).waitFor()
    await page.getByLabel('Search by name or e-mail').fill(p.email)
    const people = page.getByRole('table', { name: 'People' })
    await expect.poll(() => people.locator('tbody th[scope=row]').allTextContents()).toEqual([name])
    expect(await page.getByText('1–1 of 1 person').count()).toBe(1)

    await page.getByRole('button', { name: `Change the crews of ${name}` }).click()
    await page.getByRole('checkbox', { name: 'Skerrow Point Station' }).check()
    await page.getByRole('button', { name: 'Save crews' }).click()
    await page.getByText(`${name} moved into Skerrow Point Station.`).waitFor()
    expect(crewsOf(p.id)).toEqual([skerrow])
    // The table reloads after the notice: wait for the row to show the crew the database holds.
    await expect.poll(() => people.locator('tbody tr').first().textContent()).toContain('Skerrow Point Station')

    await page.getByRole('button', { name: `Change the crews of ${name}` }).click()
    await page.getByRole('checkbox', { name: 'Skerrow Point Station' }).uncheck()
    await page.getByRole('checkbox', { name: 'Vellan Ness Station' }).check()
    await shot(page, 'admin-people-crews')
    await page.getByRole('button', { name: 'Save crews' }).click()
    await page.getByText(`${name} moved out of Skerrow Point Station and into Vellan Ness Station.`).waitFor()
    expect(crewsOf(p.id)).toEqual([vellan])

    await page.goto('/admin/audit')
    await page.getByLabel('Search by person, crew, action or detail').fill(name)
    const rows = page.locator('tbody tr')
    // The three crew changes among what the search finds of the person (their invitation too).
    const crewActions = async () => (await rows.locator('td:nth-child(3)').allTextContents()).map(t => t.trim()).filter(a => a.startsWith('crew.member')).sort()
    await expect.poll(crewActions).toEqual(['crew.member.add', 'crew.member.add', 'crew.member.remove'])
    const moved = rows.filter({ hasText: 'crew.member.add' }).first()
    // Readable fields, not JSON: the person's name under "Person", no braces anywhere.
    expect(await moved.locator('dt').allTextContents()).toContain('Person')
    expect(await moved.locator('dd').allTextContents()).toContain(name)
    expect(await page.locator('tbody').textContent()).not.toMatch(/[{}]/)
    await shot(page, 'admin-audit-search')
    // The same screens on a phone: nothing wider than the screen but the tables' own scrolling boxes.
    await page.setViewportSize(PHONE)
    await expect.poll(() => page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true)
    await shot(page, 'admin-audit-search-phone')
    await page.goto('/admin')
    await page.getByRole('table', { name: 'People' }).waitFor()
    expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true)
    await shot(page, 'admin-people-phone')
    await context.close()
  })

  it('lists waiting invitations, sends one again and withdraws another; the outbox link opens the invitation', async () => {
    const email = `browser-wait-${Date.now().toString(36)}@glint.test`
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'admin@glint.demo')
    await page.goto('/admin')
    await page.getByLabel('E-mail of the person to invite').fill(email)
    await page.getByRole('button', { name: 'Send invitation' }).click()
    await page.getByText(`Invitation sent to ${email}.`).waitFor()
    const waiting = page.getByRole('table', { name: 'Waiting invitations' })
    await waiting.getByRole('rowheader', { name: email }).waitFor()

    await page.getByRole('button', { name: `Send again to ${email}` }).click()
    await page.getByText(`Sent again to ${email}; the earlier link no longer works.`).waitFor()
    const rowsOf = () => readDb(db => db.prepare('SELECT revoked_reason FROM invitations WHERE email = ? ORDER BY created_at').pluck().all(email))
    expect(rowsOf()).toEqual(['replaced', null])
    await shot(page, 'admin-invitations')

    // The outbox's link is a link: following it opens the form of the newest invitation.
    await page.goto('/admin/outbox')
    const links = page.locator('article', { hasText: `to ${email}` }).getByRole('link', { name: /\/invite\?token=/ })
    await expect.poll(() => links.count()).toBe(2)
    await shot(page, 'admin-outbox-links')
    const href = (await links.first().getAttribute('href'))!
    const invitePage = await context.newPage()
    await invitePage.goto(new URL(href).pathname + new URL(href).search)
    await invitePage.getByRole('button', { name: 'Create my account' }).waitFor()
    await invitePage.close()

    await page.goto('/admin')
    page.once('dialog', d => void d.accept())
    await page.getByRole('button', { name: `Withdraw the invitation to ${email}` }).click()
    await page.getByText(`Invitation to ${email} withdrawn.`).waitFor()
    expect(rowsOf()).toEqual(['replaced', 'revoked'])
    await expect.poll(() => waiting.getByRole('rowheader', { name: email }).count()).toBe(0)
    await context.close()
  })

  it('inviting an address that has an account offers to add that person to the crew, and does', async () => {
    const p = await directPerson(['trainee'], null, false)
    const name = nameOf(p.id)
    const skerrow = crewNamed('Skerrow Point Station')
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'admin@glint.demo')
    await page.goto(`/crews/${skerrow}/members`)
    await page.getByLabel('E-mail of the person to invite').fill(p.email)
    await page.getByRole('button', { name: 'Send invitation' }).click()
    await page.getByText('That address already has a Glint account.', { exact: false }).waitFor()
    await page.getByRole('button', { name: `Add ${name} to this crew` }).click()
    await page.getByText(`${name} is now in this crew.`).waitFor()
    expect(crewsOf(p.id)).toEqual([skerrow])
    expect(readDb(db => db.prepare(`SELECT count(*) FROM invitations WHERE email = ?`).pluck().get(p.email))).toBe(0)
    await shot(page, 'admin-crew-add-existing')
    await context.close()
  })

  it('opening a used invitation link says so before any form', async () => {
    const admin = await signedIn('admin@glint.demo')
    const email = `browser-used-${Date.now().toString(36)}@glint.test`
    await admin.post('/api/invites', { email, role: 'trainee', crewId: null })
    const token = (await linkFromOutbox(admin, email, '/invite'))!
    expect((await new Client().post('/api/invites/accept', { token, name: 'Used Link', password: 'a long enough test phrase' })).status).toBe(201)
    const { context, page } = await newPage(browser, DESKTOP)
    await page.goto(`/invite?token=${token}`)
    await page.getByText('This invitation was already used to make an account. Sign in with that account instead.').waitFor()
    expect(await page.getByLabel('Choose a password').count()).toBe(0)
    await shot(page, 'invite-used-link')
    await context.close()
  })
})

describe('everyone\'s own settings (issue 17, item 3)', () => {
  it('changes the name and the password; the other session ends, this one stays', async () => {
    const p = await directPerson(['trainee'], null, false)
    const elsewhere = await new Client().login(p.email, TRAINEE_PASSWORD)
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, p.email, TRAINEE_PASSWORD)
    await page.goto('/settings')
    await page.getByLabel('Name shown to your crew').fill('Ilse Marrowby')
    await page.getByRole('button', { name: 'Save name' }).click()
    await page.getByText('Your name is now Ilse Marrowby.').waitFor()
    expect(nameOf(p.id)).toBe('Ilse Marrowby')

    await page.getByLabel('Current password').fill(TRAINEE_PASSWORD)
    await page.getByLabel('New password').fill('lanterns over the breakwater')
    await page.getByRole('button', { name: 'Change password' }).click()
    await page.getByText('Password changed. Your other devices are signed out.').waitFor()
    await shot(page, 'settings-name-password')
    await page.setViewportSize(PHONE)
    await shot(page, 'settings-name-password-phone')
    await page.setViewportSize(DESKTOP)
    expect((await elsewhere.get('/api/auth/me')).status).toBe(401)
    await page.reload()
    await page.getByRole('heading', { name: 'Settings' }).waitFor()
    expect(page.url()).toMatch(/\/settings$/)
    await new Client().login(p.email, 'lanterns over the breakwater')
    await context.close()
  })
})
