import { Checkbox, Form, Typography } from 'antd';
import { roleOptions } from '@/components/ui/role-tags';

const ROLE_HINTS = {
  reader: 'types the first pass of readings',
  checker: 'enters the blind second pass and resolves mismatches',
  engineer: 'sets up instruments and calibrations, analyses',
  lead: 'invites people, assigns work, signs off',
} as const;

/** Role picker used when inviting and when changing someone's roles. */
export function RoleCheckboxes({ name = 'roles' }: { name?: string }) {
  return (
    <Form.Item
      label="Roles"
      name={name}
      rules={[{ required: true, type: 'array', min: 1, message: 'Pick at least one role' }]}
    >
      <Checkbox.Group className="role-checkboxes">
        {roleOptions.map((option) => (
          <Checkbox key={option.value} value={option.value}>
            {option.label} <Typography.Text type="secondary">— {ROLE_HINTS[option.value]}</Typography.Text>
          </Checkbox>
        ))}
      </Checkbox.Group>
    </Form.Item>
  );
}
