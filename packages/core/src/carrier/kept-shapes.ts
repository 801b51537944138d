/**
 * The last object made of each class whose methods run per epoch in a session, kept until the next one of
 * its class is made (so beyond its session).
 *
 * Why: a JavaScript engine compiles the hot functions of a session into optimised code that checks the
 * shapes (V8: hidden classes, "maps") of the objects it reads. V8 drops a shape a couple of full garbage
 * collections after the last object of that shape died, and with it every piece of optimised code that
 * checks for it (from memory: flag --retain-maps-for-n-gc, default 2; "weak objects" in --trace-deopt).
 * Between two sessions of a batch no object of the filter's classes may be alive for many collections (the
 * outputs of one session are written, the next is read): each session then had its hot functions compiled
 * again from nothing. One object kept per class keeps the shapes, and so the code, from one session to the
 * next. The classes release their session's data when it ends, whether it ended well or failed
 * (EpochRecords.close, PassResults.release, PassRunner.dropPassState; a run whose epochs are never
 * iterated keeps its records until the next session: CarrierRun.epochs), and the rover reader is handed its inputs (ephemerides, reference files) rather than keeping
 * them, so what stays is small (about 1 MB after a day of BELE00BRA with a day's multi-GNSS broadcast file).
 */

/** The last object of each class, by its constructor. */
const kept = new Map<unknown, object>();

/** Keeps `instance` as its class's object (instead of the one before): called at the end of a constructor. */
export function keepShape(instance: object): void {
  kept.set(instance.constructor, instance);
}
