/**
 * The hub's verdict on a pour. Same values as protocol's `PourVerdict` (mix math work); the
 * station only draws it and never works one out.
 */
export type GaugeVerdict = 'UNDER' | 'SETTLING' | 'GO' | 'OVER';

export interface GaugeBand {
  lowG: number;
  highG: number;
}
