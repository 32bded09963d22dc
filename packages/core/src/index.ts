export { CodeweirError, isCodeweirError } from './error.ts';
export type { ErrorCode, ErrorContext } from './error.ts';
export { writeFileAtomic, writeFilesAtomic, removePendingTemps, pendingTemps } from './atomic.ts';
export { seededRandom } from './random.ts';
export { workerEntry } from './worker.ts';
