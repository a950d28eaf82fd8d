import { unitLabel, type Cavity } from '@tareline/protocol';

/** A saved cavity in words, as it was measured: "box 4 × 2 × 1 in". */
export function cavityText(cavity: Cavity): string {
  switch (cavity.shape) {
    case 'box':
      return `box ${cavity.length} × ${cavity.width} × ${cavity.height} ${unitLabel(cavity.unit)}`;
    case 'cylinder':
      return `round, ${cavity.diameter !== undefined ? `diameter ${cavity.diameter}` : `radius ${cavity.radius}`}, height ${cavity.height} ${unitLabel(cavity.unit)}`;
    case 'frustum':
      return `tapered round, top ${cavity.topDiameter}, bottom ${cavity.bottomDiameter}, height ${cavity.height} ${unitLabel(cavity.unit)}`;
    case 'volume':
      return `known volume ${cavity.volume} ${unitLabel(cavity.unit)}`;
    case 'water':
      return `${cavity.waterMassG} g of water at ${cavity.waterTempC} °C`;
  }
}
