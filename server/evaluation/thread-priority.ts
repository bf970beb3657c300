// Evaluation threads run at a lower CPU priority than the thread that answers HTTP
// requests. On a small machine the workers would otherwise compete on equal terms with
// the event loop and PostgreSQL, and a list request would wait behind a long integral.
// Raising a thread's nice value is allowed without privileges (common practice for
// background work); the kernel still gives the workers every idle cycle.
import { readlinkSync } from 'node:fs';
import { setPriority } from 'node:os';

/** The calling thread's kernel id, on Linux (where /proc/thread-self names it). */
function kernelThreadId(): number | null {
  try {
    const id = Number(readlinkSync('/proc/thread-self').split('/').pop());
    return Number.isInteger(id) && id > 0 ? id : null;
  } catch {
    return null;
  }
}

/** Lowers the calling thread's priority by `niceness` (0–19); a no-op where that is not possible. */
export function lowerThisThreadPriority(niceness: number): boolean {
  const tid = kernelThreadId();
  if (tid === null) return false;
  try {
    // On Linux, setpriority() with a thread id changes only that thread.
    setPriority(tid, niceness);
    return true;
  } catch {
    return false;
  }
}
