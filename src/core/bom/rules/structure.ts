/**
 * Role map -> BOM lines. A role names a reference designator; BOM lines may
 * group several designators that share a value ("R3, R7" or "R3 R7"), as BOM
 * exports commonly do. Designators compare trimmed and case-blind ("r12" = "R12").
 */
import type { TopologyDefinition } from '../../circuit/topologies/topology.ts';
import { BOM_RULES } from '../codes.ts';
import { ruleResult } from '../rule.ts';
import type { BomLine, BomRuleResult } from '../types.ts';

export interface BoundRole {
  role: string;
  /** The designator as the role map wrote it. */
  refdes: string;
  line: BomLine;
}

export interface RoleBinding {
  bound: BoundRole[];
  rules: BomRuleResult[];
}

function designatorKey(refdes: string): string {
  return refdes.trim().toUpperCase();
}

/** The designators of one line: a single one, or a comma/space/semicolon separated group. */
export function lineDesignators(refdes: string): string[] {
  return refdes.split(/[\s,;]+/).filter(Boolean).map(designatorKey);
}

/** Index of the BOM by designator; designators listed on more than one line are collected apart. */
function indexLines(lines: readonly BomLine[]): { byDesignator: Map<string, BomLine>; duplicated: Set<string> } {
  const byDesignator = new Map<string, BomLine>();
  const duplicated = new Set<string>();
  for (const line of lines) {
    for (const key of lineDesignators(typeof line.refdes === 'string' ? line.refdes : '')) {
      if (byDesignator.has(key)) duplicated.add(key);
      else byDesignator.set(key, line);
    }
  }
  return { byDesignator, duplicated };
}

export function bindRoles(topology: TopologyDefinition, roles: Readonly<Record<string, string>>, lines: readonly BomLine[]): RoleBinding {
  const { byDesignator, duplicated } = indexLines(lines);
  const bound: BoundRole[] = [];
  const rules: BomRuleResult[] = [];
  for (const [role, spec] of Object.entries(topology.roles)) {
    const refdes = roles[role];
    if (refdes === undefined) {
      if (spec.required) {
        rules.push(
          ruleResult(BOM_RULES.roleUnassigned, `Topology '${topology.id}' needs ${role} (${spec.description}); the role map names no designator for it`, {}, { role }),
        );
      }
      continue;
    }
    const key = designatorKey(refdes);
    if (duplicated.has(key)) {
      rules.push(
        ruleResult(BOM_RULES.refdesDuplicated, `${refdes} appears on more than one BOM line: which part is fitted is undefined`, {}, { refdes, role }),
      );
      continue;
    }
    const line = byDesignator.get(key);
    if (!line) {
      rules.push(ruleResult(BOM_RULES.refdesMissing, `The role map puts ${role} at ${refdes}, but no BOM line carries ${refdes}`, {}, { refdes, role }));
      continue;
    }
    bound.push({ role, refdes: refdes.trim(), line });
  }
  for (const [role, refdes] of Object.entries(roles)) {
    if (!(role in topology.roles)) {
      rules.push(
        ruleResult(
          BOM_RULES.roleUnknown,
          `Topology '${topology.id}' has no role '${role}'; its roles are ${Object.keys(topology.roles).join(', ')}`,
          {},
          { refdes, role },
        ),
      );
    }
  }
  return { bound, rules };
}
