import { describe, expect, it } from 'vitest';
import { render, screen } from '@testing-library/react';
import { AuditDiff, diffSnapshots } from './audit-diff';

describe('diffSnapshots', () => {
  it('lists only changed, added and removed fields, in name order', () => {
    expect(
      diffSnapshots(
        { name: 'Core A', roles: ['reader'], status: 'active', dropped: 1 },
        { name: 'Core B', roles: ['reader'], status: 'active', added: true },
      ),
    ).toEqual([
      { key: 'added', kind: 'added', after: true },
      { key: 'dropped', kind: 'removed', before: 1 },
      { key: 'name', kind: 'changed', before: 'Core A', after: 'Core B' },
    ]);
  });

  it('treats a created entity as all-new fields and a deleted one as all-removed', () => {
    expect(diffSnapshots(null, { email: 'a@b.test' })).toEqual([{ key: 'email', kind: 'added', after: 'a@b.test' }]);
    expect(diffSnapshots({ email: 'a@b.test' }, null)).toEqual([{ key: 'email', kind: 'removed', before: 'a@b.test' }]);
  });

  it('compares arrays by value, so re-sent identical roles are not a change', () => {
    expect(diffSnapshots({ roles: ['reader', 'checker'] }, { roles: ['reader', 'checker'] })).toEqual([]);
    expect(diffSnapshots({ roles: ['reader'] }, { roles: ['reader', 'lead'] })).toHaveLength(1);
  });
});

describe('AuditDiff', () => {
  it('shows old and new value of a changed field', () => {
    render(<AuditDiff before={{ name: 'Core A' }} after={{ name: 'Core B' }} />);
    expect(screen.getByText('“Core A”').tagName).toBe('DEL');
    expect(screen.getByText('“Core B”').tagName).toBe('INS');
  });

  it('says so when nothing differs', () => {
    render(<AuditDiff before={{ name: 'Core A' }} after={{ name: 'Core A' }} />);
    expect(screen.getByText('No field changes')).toBeInTheDocument();
  });
});
