/**
 * The network vocabulary topologies describe themselves in. The nodal solve
 * itself is compiled per circuit shape (engine/compiled-network.ts, docs/model.md §1).
 */

/** A resistive branch with an optional series EMF (a diode's forward drop).
 *  Current from `from` to `to` is (V_from − V_to − emfV) / resistanceOhm. */
export interface Branch {
  from: number;
  to: number;
  resistanceOhm: number;
  emfV: number;
  /** Label used for currents reported back (e.g. the part role). */
  label: string;
}
