// Draws Glint's app icons (the project's own mark) to PNG with Debian's Chromium:
// `npx tsx scripts/icons.ts`. The output in public/icons/ is committed.
import { readFileSync } from 'node:fs'
import { chromium } from 'playwright-core'

const mark = readFileSync('public/glint-mark.svg', 'utf8')
// Maskable icons keep the mark inside the central 80 % safe zone on a full-bleed background.
const maskable = mark
  .replace('<rect width="64" height="64" rx="14" fill="#0f2a3d"/>', '<rect width="64" height="64" fill="#0f2a3d"/><g transform="translate(12.8 12.8) scale(0.6)">')
  .replace('</svg>', '</g></svg>')

const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox', '--disable-gpu'] })
const page = await browser.newPage()
for (const [name, svg] of [['icon', mark], ['maskable', maskable]] as const) {
  for (const size of [192, 512]) {
    await page.setViewportSize({ width: size, height: size })
    await page.setContent(`<html><body style="margin:0;background:transparent">${svg.replace('<svg ', `<svg width="${size}" height="${size}" `)}</body></html>`)
    await page.screenshot({ path: `public/icons/${name}-${size}.png`, omitBackground: true, clip: { x: 0, y: 0, width: size, height: size } })
  }
}
await page.setViewportSize({ width: 180, height: 180 })
await page.setContent(`<html><body style="margin:0">${maskable.replace('<svg ', '<svg width="180" height="180" ')}</body></html>`)
await page.screenshot({ path: 'public/icons/apple-touch-icon.png', clip: { x: 0, y: 0, width: 180, height: 180 } })
await browser.close()
console.log('icons written to public/icons/')
