// One private mathjs instance for units and expressions. A private instance keeps us apart from
// anything else that might change mathjs's shared default instance (createUnit, import), and
// `predictable: true` makes sqrt(−1) and similar give NaN instead of a complex number, so a bad
// expression shows up as "not a finite number" rather than as an object we would misread.
import { all, create } from 'mathjs';

export const math = create(all, { predictable: true });
