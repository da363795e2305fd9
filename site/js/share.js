// Keeping and sharing a study, all inside this browser:
//
//   - a study file (the engine's study JSON: data, roles, left-out units,
//     model settings) to save and to open again;
//   - a share link that carries the whole study in the address's fragment
//     (the part after '#', which browsers never send to any server):
//       #s=<base64url(deflate-raw(study JSON))>
//       #e=<base64url(salt 16 bytes | IV 12 bytes | AES-GCM-256 ciphertext)>
//     where the encrypted form's key comes from a passphrase through
//     PBKDF2-SHA-256 with 600,000 iterations (OWASP password storage
//     guidance, 2023), and the ciphertext holds the compressed study;
//   - an opt-in copy in this browser's local storage, with a way to forget it;
//   - a question before leaving the page with unsaved changes.
//
// Nothing here touches the network. The page (main.js) hands in the few
// things it needs through the Keeper's constructor.

import { $, download, debounce } from './dom.js';

const KEEP_KEY = 'peerlens.keptStudy';
const LONG_LINK = 8000; // characters; longer links may break in mail and chat tools
const ITERATIONS = 600000;
const enc = new TextEncoder();
const dec = new TextDecoder('utf-8', { fatal: true });

// LinkError is a share link that cannot be opened, with a message for people.
export class LinkError extends Error {}

// --- bytes and text -------------------------------------------------------

export function toBase64url(bytes) {
  let s = '';
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode.apply(null, bytes.subarray(i, i + 0x8000));
  return btoa(s).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

export function fromBase64url(text) {
  if (!/^[A-Za-z0-9_-]*$/.test(text) || text.length % 4 === 1) throw new LinkError('The link contains characters that do not belong in it: it may have been cut or changed while being copied.');
  const b = atob(text.replace(/-/g, '+').replace(/_/g, '/') + '==='.slice((text.length + 3) % 4));
  const out = new Uint8Array(b.length);
  for (let i = 0; i < b.length; i++) out[i] = b.charCodeAt(i);
  return out;
}

async function through(bytes, stream) {
  const s = new Blob([bytes]).stream().pipeThrough(stream);
  return new Uint8Array(await new Response(s).arrayBuffer());
}

const deflate = (bytes) => through(bytes, new CompressionStream('deflate-raw'));
const inflate = (bytes) => through(bytes, new DecompressionStream('deflate-raw'));

async function passKey(passphrase, salt) {
  const base = await crypto.subtle.importKey('raw', enc.encode(passphrase), 'PBKDF2', false, ['deriveKey']);
  return crypto.subtle.deriveKey({ name: 'PBKDF2', hash: 'SHA-256', salt, iterations: ITERATIONS }, base, { name: 'AES-GCM', length: 256 }, false, ['encrypt', 'decrypt']);
}

// makeLink returns the fragment ("s=..." or "e=...") that carries study.
export async function makeFragment(study, passphrase) {
  const packed = await deflate(enc.encode(JSON.stringify(study)));
  if (!passphrase) return 's=' + toBase64url(packed);
  const salt = crypto.getRandomValues(new Uint8Array(16));
  const iv = crypto.getRandomValues(new Uint8Array(12));
  const key = await passKey(passphrase, salt);
  const sealed = new Uint8Array(await crypto.subtle.encrypt({ name: 'AES-GCM', iv }, key, packed));
  const all = new Uint8Array(28 + sealed.length);
  all.set(salt, 0);
  all.set(iv, 16);
  all.set(sealed, 28);
  return 'e=' + toBase64url(all);
}

// linkKind tells what a fragment (without '#') carries: 's', 'e' or ''.
export function linkKind(fragment) {
  const m = /^([se])=/.exec(fragment || '');
  return m ? m[1] : '';
}

// readFragment turns a fragment back into the study object. It throws a
// LinkError with a plain message for a damaged, cut or wrongly unlocked link.
export async function readFragment(fragment, passphrase) {
  const kind = linkKind(fragment);
  if (!kind) throw new LinkError('This link does not hold a study.');
  let bytes = fromBase64url(fragment.slice(2));
  if (kind === 'e') {
    if (bytes.length < 28 + 16) throw new LinkError('This locked link is too short: it was probably cut off while being copied. Ask for the whole link, or for the study file instead.');
    const key = await passKey(passphrase || '', bytes.subarray(0, 16));
    try {
      bytes = new Uint8Array(await crypto.subtle.decrypt({ name: 'AES-GCM', iv: bytes.subarray(16, 28) }, key, bytes.subarray(28)));
    } catch {
      throw new LinkError('That passphrase does not open this link (or the link was changed or cut off). Nothing was opened; check the passphrase and try again.');
    }
  }
  let text;
  try {
    text = dec.decode(await inflate(bytes));
  } catch {
    throw new LinkError('This link is damaged or incomplete: it was probably cut off while being copied. Ask for the whole link, or for the study file instead.');
  }
  try {
    return JSON.parse(text);
  } catch {
    throw new LinkError('This link is damaged: the study inside it cannot be read.');
  }
}

// --- the page part ----------------------------------------------------------

// Keeper wires the save, open, link and keep controls. host gives:
//   engine(): the engine (for checking a study before it is shown),
//   study(): the study being edited (file form), or null,
//   load(study, note): shows a study, as if opened; returns a promise,
//   run(): compares the units of the study shown; returns a promise.
export class Keeper {
  constructor(host) {
    this.host = host;
    this.baseline = null; // JSON of the study as last saved, opened or kept
    this.keepSoon = debounce(() => this.keepNow(), 300);
    this.pending = ''; // a locked fragment waiting for its passphrase
    this.opens = 0; // studies opened from a file or a link (for tests)
    this.wire();
  }

  wire() {
    $('save-study').addEventListener('click', () => this.saveFile());
    $('open-study').addEventListener('change', (e) => {
      const f = e.target.files[0];
      e.target.value = '';
      if (f) this.openFile(f);
    });
    $('make-link').addEventListener('click', () => this.makeLink());
    $('copy-link').addEventListener('click', () => this.copyLink());
    $('unlock').addEventListener('submit', (e) => {
      e.preventDefault();
      this.unlock();
    });
    $('keep-here').addEventListener('change', (e) => this.setKeeping(e.target.checked));
    $('forget-here').addEventListener('click', () => this.forget());
    $('print-report').addEventListener('click', () => window.print());
    window.addEventListener('hashchange', () => this.openFromAddress());
    window.addEventListener('beforeunload', (e) => {
      if (!this.unsaved()) return;
      e.preventDefault();
      e.returnValue = ''; // older browsers need this to ask
    });
    this.showKept();
  }

  say(text, kind) {
    const n = $('share-status');
    n.textContent = text;
    n.className = 'share-status' + (kind ? ' ' + kind : '');
  }

  current() {
    const s = this.host.study();
    return s ? JSON.stringify(s) : null;
  }

  // unsaved tells whether the study has changes that would be lost.
  unsaved() {
    const now = this.current();
    return now !== null && now !== this.baseline && !this.keeping();
  }

  // loaded is called by the page whenever a study is shown: a table just
  // read from the user counts as unsaved, anything opened as saved.
  loaded(study, fromTable) {
    this.baseline = fromTable ? null : JSON.stringify(study);
    if (this.keeping()) this.keepNow();
  }

  // changed is called by the page after every edit.
  changed() {
    if (this.keeping()) this.keepSoon();
  }

  // restore opens a study from the address or from this browser, when
  // there is one; it returns true when a study was shown.
  async restore() {
    if (linkKind(location.hash.slice(1))) return this.openFromAddress();
    const kept = this.kept();
    if (kept) {
      try {
        await this.show(JSON.parse(kept), 'Opened the study kept in this browser.');
        return true;
      } catch (err) {
        this.say('The study kept in this browser could not be opened (' + messageOf(err) + '). It is still kept; use "Forget it" to remove it.', 'bad');
      }
    }
    return false;
  }

  async openFromAddress() {
    const fragment = location.hash.slice(1);
    const kind = linkKind(fragment);
    if (!kind) return false;
    $('unlock').hidden = true;
    if (kind === 'e') {
      this.pending = fragment;
      $('unlock').hidden = false;
      $('unlock-pass').value = '';
      $('unlock-pass').focus();
      this.say('This link is locked with a passphrase. Enter it to open the study.', 'busy');
      $('share').scrollIntoView({ block: 'nearest' });
      return false;
    }
    try {
      await this.show(await readFragment(fragment), 'Opened the study from the link.');
      return true;
    } catch (err) {
      this.say(messageOf(err) + ' The page still works: the demo study or your own table can be used as usual.', 'bad');
      return false;
    }
  }

  async unlock() {
    const pass = $('unlock-pass').value;
    if (!pass) {
      this.say('Enter the passphrase first.', 'bad');
      return;
    }
    this.say('Unlocking… (this takes a moment on purpose, to slow down guessing)', 'busy');
    try {
      const study = await readFragment(this.pending, pass);
      $('unlock').hidden = true;
      $('unlock-pass').value = '';
      this.pending = '';
      await this.show(study, 'Opened the study from the locked link.');
    } catch (err) {
      this.say(messageOf(err), 'bad');
    }
  }

  // show checks a study with the engine (which reads it exactly as from a
  // file), shows it and computes its results.
  async show(study, note) {
    if (!study || typeof study !== 'object' || Array.isArray(study)) throw new LinkError('This is not a Peerlens study.');
    await this.host.engine().validate(study); // throws the engine's message for a study that does not fit together
    await this.host.load(study, note);
    this.baseline = JSON.stringify(study);
    this.opens++;
    this.say(note + ' Its results are computed again now.', 'ok');
    await this.host.run();
  }

  saveFile() {
    const s = this.current();
    if (s === null) return;
    const study = JSON.parse(s);
    const name = (study.title || 'study').replace(/[^\p{L}\p{N} _-]+/gu, '').trim().replace(/\s+/g, '-').slice(0, 60) || 'study';
    download(new Blob([JSON.stringify(study, null, 2) + '\n'], { type: 'application/json' }), 'peerlens-' + name + '.json');
    this.baseline = s;
    this.say('Saved the study as a file. Open it again with "Open a study file…".', 'ok');
  }

  async openFile(file) {
    this.say('Opening ' + file.name + '…', 'busy');
    let study;
    try {
      study = JSON.parse(await file.text());
    } catch {
      this.say(file.name + ' is not a study file: it is not JSON text. Tables go in the "Your data" box above.', 'bad');
      return;
    }
    try {
      await this.show(study, 'Opened ' + file.name + '.');
    } catch (err) {
      this.say(file.name + ' could not be opened: ' + messageOf(err), 'bad');
    }
  }

  async makeLink() {
    const s = this.current();
    if (s === null) return;
    const pass = $('link-pass').value;
    this.say(pass ? 'Locking the link…' : 'Making the link…', 'busy');
    const fragment = await makeFragment(JSON.parse(s), pass);
    const link = location.href.split('#')[0] + '#' + fragment;
    const out = $('share-link');
    out.value = link;
    $('share-link-row').hidden = false;
    const long = link.length > LONG_LINK;
    $('link-too-long').hidden = !long;
    if (long) $('link-too-long').textContent = 'This link is ' + link.length.toLocaleString('en-GB') + ' characters long: some mail and chat tools cut links longer than about 8,000 characters. Saving the study as a file is safer for a study this size.';
    this.say((pass ? 'Made a locked link: it opens only with the passphrase, which you should send separately.' : 'Made a link. Anyone with the link can read the study, so share it like the data itself.') + ' The study travels inside the link; no copy is stored anywhere else.', long ? 'busy' : 'ok');
  }

  async copyLink() {
    const out = $('share-link');
    try {
      await navigator.clipboard.writeText(out.value);
      this.say('Copied the link.', 'ok');
    } catch {
      out.select();
      this.say('Select the link and copy it (Ctrl+C or ⌘C).', 'busy');
    }
  }

  // --- local storage, only when asked for ---
  keeping() {
    return this.kept() !== null;
  }

  kept() {
    try {
      return localStorage.getItem(KEEP_KEY);
    } catch {
      return null;
    }
  }

  keepNow() {
    const s = this.current();
    if (s === null) return;
    try {
      localStorage.setItem(KEEP_KEY, s);
      this.showKept(new Date());
    } catch (err) {
      this.say('This browser would not keep the study (' + messageOf(err) + '). Save it as a file instead.', 'bad');
      $('keep-here').checked = false;
    }
  }

  setKeeping(on) {
    if (on) {
      this.keepNow();
      this.say('This study is now kept in this browser and opens again on your next visit. Changes are kept as you make them.', 'ok');
    } else this.forget();
  }

  forget() {
    try {
      localStorage.removeItem(KEEP_KEY);
    } catch { /* nothing was kept */ }
    this.showKept();
    this.say('Forgot the study: nothing of it is kept in this browser now.', 'ok');
  }

  showKept(when) {
    const on = this.kept() !== null;
    $('keep-here').checked = on;
    $('forget-here').disabled = !on;
    $('kept-note').textContent = on
      ? 'Kept in this browser' + (when ? ' (last at ' + when.toLocaleTimeString('en-GB') + ')' : '') + '.'
      : 'Nothing is kept in this browser.';
  }
}

function messageOf(err) {
  if (!err) return 'unknown problem';
  if (typeof err === 'string') return err;
  return err.message || String(err);
}
