// The element interface of the one-turn map. The tracker calls each element's `apply` in order every turn and
// knows nothing else about it, so new kicks (induced voltage, radiation) plug in without changing the loop.
// Units: dt in s, dE in eV. An element must keep the map area-preserving in (dt, dE) unless it models a
// non-Hamiltonian effect on purpose (radiation damping, noise) and says so.
import type { Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';

export interface Element {
  readonly name: string;
  /** One pass over the alive particles b.dt/b.dE[0..b.n). `m` is the machine state of the current turn. */
  apply(b: Bunch, m: MachineState): void;
}
