import { describe, expect, it } from 'vitest';
import { SnakeNamingStrategy, snakeCase } from './snake-naming.strategy';

describe('snakeCase', () => {
  it.each([
    ['createdAt', 'created_at'],
    ['id', 'id'],
    ['tokenHash', 'token_hash'],
    ['HTTPStatus', 'http_status'],
    ['campaignId', 'campaign_id'],
    ['decimalComma', 'decimal_comma'],
  ])('%s → %s', (input, expected) => {
    expect(snakeCase(input)).toBe(expected);
  });
});

describe('SnakeNamingStrategy', () => {
  const strategy = new SnakeNamingStrategy();

  it('keeps the table name given in @Entity and snake-cases a class name otherwise', () => {
    expect(strategy.tableName('CampaignMember', 'campaign_members')).toBe('campaign_members');
    expect(strategy.tableName('CampaignMember', undefined)).toBe('campaign_member');
  });

  it('snake-cases columns, including explicit names and embedded prefixes', () => {
    expect(strategy.columnName('expiresAt', undefined, [])).toBe('expires_at');
    expect(strategy.columnName('x', 'usedAt', [])).toBe('used_at');
    expect(strategy.columnName('line1', undefined, ['postalAddress'])).toBe('postal_address_line1');
  });

  it('names join columns after the relation and the referenced column', () => {
    expect(strategy.joinColumnName('invitedBy', 'id')).toBe('invited_by_id');
    expect(strategy.joinTableColumnName('campaigns', 'id')).toBe('campaigns_id');
  });
});
