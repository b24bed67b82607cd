import type { Document } from '../../models'

/** Reports how far a render has got, as a fraction from 0 to 1. */
export type Progress = (fraction: number) => Promise<void>

/**
 * Makes the PDF of one document row. Renderers are deterministic for the same data, so a job
 * run twice stores the same object (files are keyed by their sha256).
 */
export type DocumentRenderer = (doc: Document, progress: Progress) => Promise<Buffer>
