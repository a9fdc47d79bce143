/**
 * Files the user picked or dropped, read into bytes: plain file lists (file inputs, also with a
 * folder chosen through webkitdirectory) and drag-and-drop, where folders are walked recursively.
 * Inside folders only text exports and settings files (settings.json kept with the data) are
 * taken, so a folder of images and notes does not fill the problem list.
 */
import { isSettingsFileName } from '../io/index.ts';
import type { FileInput } from '../state/session.svelte.ts';

/** Extensions read from inside folders. */
const TEXT_EXPORTS = /\.(csv|tsv|txt|dat|asc|xy)$/i;

/** Is this entry of a folder read: a text export or a settings file, not hidden. */
function takenFromFolder(name: string): boolean {
  return !name.startsWith('.') && (TEXT_EXPORTS.test(name) || isSettingsFileName(name));
}

async function toInput(file: File, name = file.name): Promise<FileInput> {
  return { fileName: name, bytes: new Uint8Array(await file.arrayBuffer()) };
}

/**
 * Inputs from a file input's list. With a folder (webkitRelativePath set) only text exports and
 * settings files are kept; a single picked file is always kept.
 */
export async function filesFromList(list: FileList | readonly File[]): Promise<FileInput[]> {
  const files = [...list];
  const fromFolder = files.some((f) => f.webkitRelativePath);
  const kept = fromFolder ? files.filter((f) => takenFromFolder(f.name)) : files;
  return Promise.all(kept.map((f) => toInput(f)));
}

function entryFile(entry: FileSystemFileEntry): Promise<File> {
  return new Promise((resolve, reject) => entry.file(resolve, reject));
}

function readAll(reader: FileSystemDirectoryReader): Promise<FileSystemEntry[]> {
  return new Promise((resolve, reject) => {
    const all: FileSystemEntry[] = [];
    const next = () =>
      reader.readEntries((batch) => {
        if (batch.length === 0) resolve(all);
        else {
          all.push(...batch);
          next();
        }
      }, reject);
    next();
  });
}

async function walk(entry: FileSystemEntry, inFolder: boolean, out: File[]): Promise<void> {
  if (entry.isFile) {
    if (!inFolder || takenFromFolder(entry.name)) out.push(await entryFile(entry as FileSystemFileEntry));
  } else if (entry.isDirectory) {
    for (const child of await readAll((entry as FileSystemDirectoryEntry).createReader())) await walk(child, true, out);
  }
}

/** Inputs from a drop: dropped folders are walked, dropped files are taken as they are. */
export async function filesFromDrop(transfer: DataTransfer): Promise<FileInput[]> {
  const entries = [...transfer.items].map((item) => (item.kind === 'file' ? item.webkitGetAsEntry() : null));
  if (entries.some((e) => e?.isDirectory)) {
    const files: File[] = [];
    for (const entry of entries) if (entry) await walk(entry, false, files);
    return Promise.all(files.map((f) => toInput(f)));
  }
  return Promise.all([...transfer.files].map((f) => toInput(f)));
}

/**
 * Is this input a session bundle rather than an instrument export? (name ends in
 * .burrow-session.json, or a .json whose text starts like one)
 */
export function isSessionBundle(input: FileInput): boolean {
  if (/\.burrow-session\.json$/i.test(input.fileName)) return true;
  if (!/\.json$/i.test(input.fileName) || !input.bytes) return false;
  const head = new TextDecoder().decode(input.bytes.subarray(0, 200));
  return /^\s*\{\s*"format"\s*:\s*"burrow-session"/.test(head);
}
