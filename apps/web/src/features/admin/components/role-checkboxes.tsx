import { Checkbox, Fieldset, Wrap } from '@chakra-ui/react';
import { ROLE_LABELS, ROLES, type Role } from '@steadyhand/shared';

/** The five roles as checkboxes; a person may hold several. */
export function RoleCheckboxes({ value, onChange, legend, name }: { value: Role[]; onChange: (roles: Role[]) => void; legend: string; name: string }) {
  return (
    <Fieldset.Root>
      <Fieldset.Legend fontWeight="bold">{legend}</Fieldset.Legend>
      <Wrap gap="5">
        {ROLES.map((role) => (
          <Checkbox.Root
            key={role}
            size="lg"
            name={name}
            checked={value.includes(role)}
            onCheckedChange={(e) => onChange(e.checked === true ? [...value, role] : value.filter((r) => r !== role))}
          >
            <Checkbox.HiddenInput />
            <Checkbox.Control />
            <Checkbox.Label>{ROLE_LABELS[role]}</Checkbox.Label>
          </Checkbox.Root>
        ))}
      </Wrap>
    </Fieldset.Root>
  );
}
