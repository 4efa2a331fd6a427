import type { EntryFields } from '../../../lib/live/entry-build';

/** Records one tap; the pad shows Undo for it. */
export type Tap = (fields: EntryFields) => void;
