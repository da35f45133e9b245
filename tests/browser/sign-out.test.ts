// Sign-out on a shared phone (issue 14, item 15): what the service worker and the page kept of the
// person goes. RFC 9111 §5.2.2.5 keeps personal answers out of HTTP caches (no-store); the service
// worker's own caches and IndexedDB are the app's storage and are cleared by the app (OWASP MASVS-
// STORAGE: no sensitive data left on the device after sign-out; OWASP Session Management Cheat
// Sheet, "Logout": the client drops the session's data).
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { crewIdOf, freshPerson } from '../support/client'
import { launch, passIntroductions, PHONE, shot, signIn } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

// Every Cache Storage entry whose body holds `text`, as "cache url".
const cachedWith = (page: Page, text: string) => page.evaluate(async (t) => {
  const found: string[] = []
  for (const name of await caches.keys()) {
    const cache = await caches.open(name)
    for (const req of await cache.keys()) {
      const res = await cache.match(req)
      if (res && (await res.text()).includes(t)) found.push(`${name} ${req.url}`)
    }
  }
  return found
}, text)

// Stored watches in IndexedDB glint-phone (useOfflineWatch).
const storedWatches = (page: Page) => page.evaluate(() => new Promise<number>((resolve, reject) => {
  const open = indexedDB.open('glint-phone')
  open.onerror = () => reject(open.error)
  open.onsuccess = () => {
    const db = open.result
    if (!db.objectStoreNames.contains('watches')) {
      db.close()
      resolve(0)
      return
    }
    const count = db.transaction('watches').objectStore('watches').count()
    count.onsuccess = () => {
      db.close()
      resolve(count.result)
    }
  }
}))

describe('sign-out on a phone', () => {
  it('drops the cached pages, the stored watch and the person\'s copy', async () => {
    const p = await freshPerson('trainee', await crewIdOf('trainee@glint.demo'))
    const context = await browser.newContext({ viewport: PHONE, baseURL: inject('baseUrl'), hasTouch: true, isMobile: true })
    const page = await context.newPage()
    await signIn(page, p.email, p.password)
    await page.goto('/watch')
    // The service worker controls the page only after a load made once it is active.
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => true))
    await page.reload()
    await expect.poll(() => page.evaluate(() => !!navigator.serviceWorker.controller)).toBe(true)
    await page.getByRole('button', { name: /Start watch|Go on with the watch/ }).click()
    await passIntroductions(page)
    await page.getByTestId('sighting-box').waitFor()
    await page.goto('/people/me')
    await page.getByRole('heading').first().waitFor()

    // What a shared phone holds of the person while signed in.
    await expect.poll(() => cachedWith(page, p.email)).not.toEqual([])
    // The one watch this person started today, kept for a lost connection.
    await expect.poll(() => storedWatches(page)).toBe(1)
    expect(await page.evaluate(() => localStorage.getItem('glint-me'))).toContain(p.email)

    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(u => u.pathname === '/login')
    await page.getByLabel('E-mail').waitFor()
    await shot(page, 'sign-out-phone')

    expect(await cachedWith(page, p.email)).toEqual([])
    expect(await storedWatches(page)).toBe(0)
    expect(await page.evaluate(() => localStorage.getItem('glint-me'))).toBeNull()
    await context.close()
  })
})
