// Installability (issue 6): Chromium's own checks through the DevTools protocol
// (Page.getInstallabilityErrors), the manifest's fields (W3C Web App Manifest), the service worker.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it, inject } from 'vitest'
import { chromium } from 'playwright-core'
import { PHONE } from '../support/browser'

interface ManifestIcon { src: string, sizes: string, type?: string, purpose?: string }

describe('the installable app', () => {
  it('passes Chromium\'s installability checks; manifest and service worker as required', async () => {
    // A persistent profile: an incognito-like context is never installable.
    const dir = mkdtempSync(join(tmpdir(), 'glint-install-'))
    const context = await chromium.launchPersistentContext(dir, {
      executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
      args: ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-sync'],
      viewport: PHONE,
      baseURL: inject('baseUrl'),
    })
    try {
      const page = context.pages()[0] ?? await context.newPage()
      await page.goto('/login')
      await page.evaluate(() => navigator.serviceWorker.ready.then(() => true))
      await page.reload()
      await expect.poll(() => page.evaluate(() => !!navigator.serviceWorker.controller)).toBe(true)
      const scope = await page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.scope)
      expect(scope).toBe(`${inject('baseUrl')}/`.replace(/\/\/$/, '/'))

      const href = await page.locator('link[rel="manifest"]').getAttribute('href')
      expect(href).toBe('/manifest.webmanifest')
      const res = await page.request.get(href!)
      expect(res.status()).toBe(200)
      const m = await res.json() as { name: string, short_name: string, start_url: string, display: string, icons: ManifestIcon[] }
      expect(m.name).toMatch(/Glint/)
      expect(m.start_url).toBe('/')
      expect(m.display).toBe('standalone')
      const has = (size: string, purpose?: string) => m.icons.some(i => i.sizes.split(' ').includes(size) && (!purpose || (i.purpose ?? 'any').split(' ').includes(purpose)))
      expect(has('192x192')).toBe(true)
      expect(has('512x512')).toBe(true)
      expect(m.icons.some(i => (i.purpose ?? '').includes('maskable'))).toBe(true)
      for (const icon of m.icons) {
        const r = await page.request.get(icon.src)
        expect(r.status(), icon.src).toBe(200)
        expect(r.headers()['content-type']).toMatch(/image\/png/)
      }

      const cdp = await context.newCDPSession(page)
      const { installabilityErrors } = await cdp.send('Page.getInstallabilityErrors') as { installabilityErrors: { errorId: string }[] }
      expect(installabilityErrors.map(e => e.errorId)).toEqual([])
    }
    finally {
      await context.close()
      rmSync(dir, { recursive: true, force: true })
    }
  })
})
