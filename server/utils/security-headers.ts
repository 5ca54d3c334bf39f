import { randomBytes } from 'node:crypto'

/** Sent with every reply: no framing, no type sniffing, no full address to other sites. */
export const BASE_HEADERS: Record<string, string> = {
  'x-content-type-options': 'nosniff',
  'x-frame-options': 'DENY',
  'referrer-policy': 'same-origin',
  'cross-origin-opener-policy': 'same-origin',
  'permissions-policy': 'camera=(), microphone=(), geolocation=(), payment=()',
}

/** Replies that are not pages (JSON, CSV, samples) run nothing and may be framed by nobody. */
export const DATA_POLICY = 'default-src \'none\'; frame-ancestors \'none\''

export function newNonce(): string {
  return randomBytes(18).toString('base64')
}

/**
 * The pages' policy: our own scripts (Nuxt's inline config script carries the nonce), our styles and the
 * style attributes Vue renders, our fonts, samples and images. Tone's clock runs in a worker made from a
 * blob; Web MIDI and Web Audio need no source of their own.
 */
export function pagePolicy(nonce: string): string {
  return [
    'default-src \'self\'',
    `script-src 'self' 'nonce-${nonce}'`,
    'style-src \'self\' \'unsafe-inline\'',
    'img-src \'self\' data:',
    'font-src \'self\'',
    'media-src \'self\' blob:',
    'connect-src \'self\'',
    'worker-src \'self\' blob:',
    'object-src \'none\'',
    'base-uri \'self\'',
    'form-action \'self\'',
    'frame-ancestors \'none\'',
  ].join('; ')
}

/** Gives every script tag of a rendered page the nonce. */
export function addNonce(chunks: string[], nonce: string): string[] {
  return chunks.map(chunk => chunk.replace(/<script(?=[\s>])/g, `<script nonce="${nonce}"`))
}
