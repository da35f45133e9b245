// Uploads that try to make the server hold memory or a render thread (issue 14, items 7 and 13),
// against a server of its own so its memory (/proc/<pid>/status) and its log can be read.
import { type ChildProcess, spawn } from 'node:child_process'
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { request } from 'node:http'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { freePort, outputEntry, seedInto, testEnv, waitForHealth } from '../support/global-setup'

const MB = 1024 * 1024
const FIXTURES = fileURLToPath(new URL('../fixtures/images', import.meta.url))
// Design values: what the server's peak memory may move while refusing bodies it never reads
// (allocator and JIT noise of a few requests; measured 0-1 MB), and while streaming 300 MB to disk
// (buffers in flight and garbage not yet collected; measured 26 MB). A buffered body moves it by
// the body's size: 300 MB each.
const RSS_NOISE_MB = 32
const STREAMING_RSS_MB = 64

const dir = mkdtempSync(join(tmpdir(), 'glint-upload-limits-'))
const serverTmp = join(dir, 'tmp')
let child: ChildProcess
let url = ''
let log = ''

afterAll(async () => {
  if (child && child.exitCode === null) {
    const exited = new Promise(r => child.once('exit', r))
    child.kill('SIGTERM')
    await exited
  }
  rmSync(dir, { recursive: true, force: true })
})

// Linux proc(5): VmHWM is the peak resident set size, VmRSS the current one, in kB.
function memory() {
  const status = readFileSync(`/proc/${child.pid}/status`, 'utf8')
  const kb = (key: string) => Number(new RegExp(`^${key}:\\s+(\\d+) kB`, 'm').exec(status)![1])
  return { peakMb: kb('VmHWM') / 1024, rssMb: kb('VmRSS') / 1024 }
}

interface Sent { status: number, body: any, ms: number, sent: number, error?: string }

/**
 * Sends a multipart body of `files` files of `fileBytes` zero bytes each, with its true length
 * declared (or chunked), and stops sending as soon as an answer arrives.
 */
function sendUpload(client: Client, path: string, opts: { files: number, fileBytes: number, fields?: Record<string, string>, chunked?: boolean, hold?: Promise<unknown> }): Promise<Sent> {
  const boundary = `glint-test-${Math.random().toString(36).slice(2)}`
  const head = Object.entries(opts.fields ?? {}).map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`).join('')
  const fileHead = (i: number) => `--${boundary}\r\nContent-Disposition: form-data; name="files"; filename="f${i}.png"\r\nContent-Type: image/png\r\n\r\n`
  const tail = `--${boundary}--\r\n`
  let total = Buffer.byteLength(head) + Buffer.byteLength(tail)
  for (let i = 0; i < opts.files; i++) total += Buffer.byteLength(fileHead(i)) + opts.fileBytes + 2
  const started = Date.now()
  return new Promise((resolve) => {
    let sent = 0
    let answered = false
    const headers: Record<string, string | number> = {
      'content-type': `multipart/form-data; boundary=${boundary}`, 'origin': url, 'cookie': client.cookieHeader(),
    }
    if (!opts.chunked) headers['content-length'] = total
    const req = request(`${url}${path}`, { method: 'POST', headers }, (res) => {
      answered = true
      let text = ''
      res.setEncoding('utf8')
      res.on('data', (c) => {
        text += c
      })
      res.on('end', () => {
        req.destroy()
        let body: unknown = text
        try {
          body = JSON.parse(text)
        }
        catch { /* not JSON */ }
        resolve({ status: res.statusCode!, body, ms: Date.now() - started, sent })
      })
    })
    req.on('error', (e) => {
      if (!answered) resolve({ status: 0, body: null, ms: Date.now() - started, sent, error: e.message })
    })
    const zeros = Buffer.alloc(MB)
    const write = (chunk: Buffer | string) => new Promise<boolean>((ok) => {
      if (answered || req.destroyed) return ok(false)
      sent += Buffer.byteLength(chunk)
      if (req.write(chunk)) ok(true)
      else {
        const go = () => {
          req.off('drain', go).off('close', go)
          ok(!req.destroyed)
        }
        req.on('drain', go).on('close', go)
      }
    })
    void (async () => {
      if (!await write(head)) return
      for (let i = 0; i < opts.files; i++) {
        if (!await write(fileHead(i))) return
        if (opts.hold && i === 0) await opts.hold
        for (let left = opts.fileBytes; left > 0; left -= MB) {
          if (!await write(left >= MB ? zeros : zeros.subarray(0, left))) return
        }
        if (!await write('\r\n')) return
      }
      if (await write(tail)) req.end()
    })()
  })
}

let trainee: Client
let instructor: Client
let demoDeckId = ''
let deckId = ''
let typeId = ''

beforeAll(async () => {
  const env = { ...testEnv(dir, await freePort()), TMPDIR: serverTmp }
  mkdirSync(serverTmp, { recursive: true })
  seedInto(dir)
  child = spawn(process.execPath, [outputEntry()], { env, stdio: ['ignore', 'pipe', 'pipe'] })
  child.stdout!.on('data', (c) => {
    log += c
  })
  child.stderr!.on('data', (c) => {
    log += c
  })
  url = `http://127.0.0.1:${env.PORT}`
  await waitForHealth(url, child)
  trainee = await new Client(url).login('trainee@glint.demo')
  instructor = await new Client(url).login('instructor@glint.demo')
  demoDeckId = (await trainee.get('/api/decks')).body[0].id
  deckId = (await instructor.post('/api/decks', { title: 'Upload limits', category: 'aircraft' })).body.id
  typeId = (await instructor.post(`/api/decks/${deckId}/target-types`, { name: 'Corrow', affiliation: 'neutral', sizeM: 11 })).body.id
}, 120_000)

describe('upload bodies are read only for the deck\'s owner, and streamed to disk', () => {
  it('refuses three 300 MB bodies from a trainee before reading them: 403 at once, peak memory moved by noise only', async () => {
    // Warm-up: the same refusal once with a small body, so code paths are loaded before measuring.
    expect((await sendUpload(trainee, `/api/decks/${demoDeckId}/views`, { files: 1, fileBytes: 1024 })).status).toBe(403)
    const before = memory()
    const sent = await Promise.all([0, 1, 2].map(() => sendUpload(trainee, `/api/decks/${demoDeckId}/views`, { files: 1, fileBytes: 300 * MB, fields: { targetTypeId: 'x', aspect: 'plan' } })))
    const after = memory()
    console.log(`trainee, 3 x 300 MB: statuses ${sent.map(s => s.status)}, ${sent.map(s => s.ms)} ms, ${sent.map(s => Math.round(s.sent / MB))} MB sent; peak RSS ${before.peakMb.toFixed(1)} -> ${after.peakMb.toFixed(1)} MB, RSS ${before.rssMb.toFixed(1)} -> ${after.rssMb.toFixed(1)} MB`)
    for (const s of sent) {
      expect(s.status, s.error).toBe(403)
      expect(s.body.message).toMatch(/needs the instructor role/)
      // Design value: a refusal that reads nothing answers within 5 s even on a busy machine.
      expect(s.ms).toBeLessThan(5000)
    }
    expect(after.peakMb - before.peakMb).toBeLessThan(RSS_NOISE_MB)
  }, 120_000)

  it('refuses the owner\'s body past the request cap while it streams (413), holding none of it, leaving no temporary file', async () => {
    const before = memory()
    // Chunked, so no declared length warns the server: 21 files of 15 MB, past both the file count and the total.
    const r = await sendUpload(instructor, `/api/decks/${deckId}/views`, { files: 21, fileBytes: 15 * MB, fields: { targetTypeId: typeId, aspect: 'plan' }, chunked: true })
    const after = memory()
    console.log(`instructor, 21 x 15 MB chunked: ${r.status} after ${r.ms} ms, ${Math.round(r.sent / MB)} MB sent; peak RSS ${before.peakMb.toFixed(1)} -> ${after.peakMb.toFixed(1)} MB`)
    expect(r.status, r.error).toBe(413)
    expect(r.body.message).toMatch(/at most 20/)
    expect(after.peakMb - before.peakMb).toBeLessThan(STREAMING_RSS_MB)
    expect(readdirSync(serverTmp).filter(f => f.startsWith('glint-upload-'))).toEqual([])
  }, 120_000)

  it('allows two uploads of one person at a time and answers a third with 429 and a sentence', async () => {
    let open!: () => void
    const hold = new Promise<void>(r => (open = r))
    const slow = [0, 1].map(() => sendUpload(instructor, `/api/decks/${deckId}/views`, { files: 1, fileBytes: 64 * 1024, fields: { targetTypeId: typeId, aspect: 'plan' }, hold }))
    await new Promise(r => setTimeout(r, 1500))
    const third = await sendUpload(instructor, `/api/decks/${deckId}/views`, { files: 1, fileBytes: 1024, fields: { targetTypeId: typeId, aspect: 'plan' } })
    open()
    const done = await Promise.all(slow)
    expect(third.status).toBe(429)
    expect(third.body.message).toMatch(/already sending 2 uploads.*Wait until/)
    // The two held ones finish as uploads of zero bytes: every file refused as empty-looking (415).
    for (const s of done) expect(s.status).toBe(415)
    // Once they are done, the same person may send again.
    expect((await sendUpload(instructor, `/api/decks/${deckId}/views`, { files: 1, fileBytes: 1024, fields: { targetTypeId: typeId, aspect: 'plan' } })).status).toBe(415)
  }, 60_000)
})

describe('a picture that claims a huge size', () => {
  it('is refused before decoding with a sentence a person can act on, holding no render thread, with no stack trace in the log', async () => {
    const bytes = readFileSync(join(FIXTURES, 'huge-claim.jpg'))
    expect(bytes.length).toBeLessThan(4096)
    const form = new FormData()
    form.set('targetTypeId', typeId)
    form.set('aspect', 'beam')
    form.append('files', new Blob([bytes], { type: 'image/jpeg' }), 'huge-claim.jpg')
    const started = Date.now()
    const r = await instructor.post(`/api/decks/${deckId}/views`, form)
    console.log(`huge-claim.jpg: ${r.status} after ${Date.now() - started} ms: ${r.body.message}`)
    // ITU-T T.81 F.1.2: 8000 x 5000 px in a sequential JPEG need at least 156,250 bytes.
    expect(r.status, r.text).toBe(422)
    expect(r.body.message).toMatch(/declares 8000 x 5000 px .*cut off or damaged\. Upload the whole file again\./)
    expect(r.body.message).not.toMatch(/\n\s+at |Error:/)
    expect(log).not.toMatch(/\n\s+at |\[render job\]/)
  }, 90_000)
})
