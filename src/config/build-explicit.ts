/**
 * Builds an `ExplicitModel` from a `network:` block and checks what the schema cannot: tensor
 * names are unique, bonds name existing and distinct tensors, leg positions lie inside the shape,
 * and every position has at least one open leg.
 */
import { closest } from '../text/suggest.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { displayPath, fieldOf, type Located, type LocatedMap } from './located-value.js';
import { asMap, nonNegativeIntegerOf, positiveIntegerListOf, positiveIntegerOf, stringOf } from './located-read.js';
import { positionCount, type ExplicitBond, type ExplicitLeg, type ExplicitModel, type ExplicitTensor } from './model.js';

/** Positions listed by name in one message before it says "and N more". */
const LISTED_POSITIONS = 10;

export function buildExplicitModel(root: LocatedMap, file: string, sink: DiagnosticSink): ExplicitModel | undefined {
  const network = asMap(fieldOf(root, 'network'));
  if (!network) return undefined;
  const shapeNode = fieldOf(network, 'shape');
  const shape = positiveIntegerListOf(shapeNode);
  const validShape = shape && shape.length >= 1 && shape.length <= 2 ? shape : undefined;
  const positions = validShape ? positionCount(validShape) : undefined;
  let ok = validShape !== undefined;

  const tensors: ExplicitTensor[] = [];
  const firstByName = new Map<string, Located>();
  const tensorsNode = fieldOf(network, 'tensors');
  const covered = new Set<number>();
  for (const item of tensorsNode?.kind === 'seq' ? tensorsNode.items : []) {
    const tensor = asMap(item);
    const nameNode = tensor ? fieldOf(tensor, 'name') : undefined;
    const name = stringOf(nameNode);
    if (!tensor || name === undefined || name === '' || !nameNode) {
      ok = false;
      continue;
    }
    const earlier = firstByName.get(name);
    if (earlier) {
      sink.error('config/duplicate-tensor', `${displayPath(nameNode)} is '${name}', which ${displayPath(earlier)} (line ${earlier.span.line}) already names; tensor names must be unique`, nameNode.span);
      ok = false;
    } else {
      firstByName.set(name, nameNode);
    }
    const legs: ExplicitLeg[] = [];
    const legsNode = fieldOf(tensor, 'legs');
    if (legsNode !== undefined && legsNode.kind !== 'seq') ok = false;
    for (const legItem of legsNode?.kind === 'seq' ? legsNode.items : []) {
      const leg = asMap(legItem);
      const positionNode = leg ? fieldOf(leg, 'position') : undefined;
      const position = nonNegativeIntegerOf(positionNode);
      const dim = positiveIntegerOf(leg ? fieldOf(leg, 'dim') : undefined);
      if (!leg || position === undefined || dim === undefined || !positionNode) {
        ok = false;
        continue;
      }
      if (positions !== undefined && position >= positions) {
        sink.error(
          'config/position-out-of-range',
          `${displayPath(positionNode)} is ${position}, but the shape [${validShape!.join(', ')}] has positions 0 to ${positions - 1} (numbered row-major)`,
          positionNode.span,
        );
        ok = false;
        continue;
      }
      covered.add(position);
      legs.push({ position, dim, span: leg.span });
    }
    tensors.push({ name, legs, span: tensor.span });
  }
  if (tensorsNode?.kind !== 'seq' || tensorsNode.items.length === 0) ok = false;

  const bonds: ExplicitBond[] = [];
  const bondsNode = fieldOf(network, 'bonds');
  if (bondsNode !== undefined && bondsNode.kind !== 'seq') ok = false;
  const names = [...firstByName.keys()];
  for (const item of bondsNode?.kind === 'seq' ? bondsNode.items : []) {
    const bond = asMap(item);
    const betweenNode = bond ? fieldOf(bond, 'between') : undefined;
    const dim = positiveIntegerOf(bond ? fieldOf(bond, 'dim') : undefined);
    if (!bond || betweenNode?.kind !== 'seq' || betweenNode.items.length < 2 || dim === undefined) {
      ok = false;
      continue;
    }
    const members: string[] = [];
    for (const member of betweenNode.items) {
      const ref = stringOf(member);
      if (ref === undefined || ref === '') {
        ok = false;
        continue;
      }
      if (!firstByName.has(ref)) {
        const guess = closest(ref, names);
        sink.error(
          'config/unknown-tensor',
          `${displayPath(member)} names the tensor '${ref}', which is not in network.tensors${guess ? ` (did you mean '${guess}'?)` : ''}`,
          member.span,
        );
        ok = false;
      } else if (members.includes(ref)) {
        sink.error('config/duplicate-bond-tensor', `${displayPath(member)} repeats '${ref}'; a bond joins different tensors`, member.span);
        ok = false;
      }
      members.push(ref);
    }
    bonds.push({ tensors: members, dim, span: bond.span });
  }

  if (positions !== undefined && shapeNode) {
    const bare: number[] = [];
    for (let p = 0; p < positions && bare.length <= LISTED_POSITIONS; p++) if (!covered.has(p)) bare.push(p);
    if (bare.length > 0) {
      const missing = positions - covered.size;
      const listed = bare.slice(0, LISTED_POSITIONS).join(', ');
      const more = missing > LISTED_POSITIONS ? ` and ${missing - LISTED_POSITIONS} more` : '';
      sink.error(
        'config/position-without-leg',
        `${missing === 1 ? 'position' : 'positions'} ${listed}${more} of ${displayPath(shapeNode)} [${validShape!.join(', ')}] ${missing === 1 ? 'has' : 'have'} no open leg; every input position needs a tensor with a leg there`,
        shapeNode.span,
      );
      ok = false;
    }
  }
  if (!ok || !validShape) return undefined;
  return { kind: 'explicit', file, shape: validShape, tensors, bonds, span: root.span };
}
