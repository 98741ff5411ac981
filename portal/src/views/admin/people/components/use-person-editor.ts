import { PersonPatch, ROLE_LABELS, ROLES, type Person, type Role } from '@localis/shared';
import { computed, ref, watch, type Ref } from 'vue';
import { useApiErrorToast } from '../../../../composables/use-api-error-toast';
import { useConfirmDialog } from '../../../../composables/use-confirm-dialog';
import { useSuccessToast } from '../../../../composables/use-success-toast';
import { useZodForm } from '../../../../composables/use-zod-form';
import { usePeopleStore } from '../../../../stores/people.store';
import { useSessionStore } from '../../../../stores/session.store';

export interface PersonDetailsForm {
  name: string;
  institutionId: string | null;
  active: boolean;
}

const detailsOf = (p: Person | null): PersonDetailsForm => ({
  name: p?.name ?? '',
  institutionId: p?.institutionId ?? null,
  active: p?.active ?? true,
});

/** The rules of the person dialog: roles change at once, details are saved together. */
export function usePersonEditor(source: Ref<Person | null>) {
  const people = usePeopleStore();
  const session = useSessionStore();
  const showApiError = useApiErrorToast();
  const showSuccess = useSuccessToast();
  const ask = useConfirmDialog();

  const current = ref<Person | null>(source.value);
  const roleToGrant = ref<Role | null>(null);
  const busy = ref<string | null>(null);
  const form = useZodForm(PersonPatch, () => detailsOf(current.value));

  // A fresher copy of the same person (after a role change) must not wipe unsaved details.
  watch(source, (person, before) => {
    current.value = person;
    if (person?.id === before?.id) return;
    roleToGrant.value = null;
    form.reset(detailsOf(person));
  });

  const grantable = computed(() =>
    ROLES.filter((r) => !current.value?.roles.includes(r)).map((r) => ({ value: r, label: ROLE_LABELS[r].label })),
  );

  async function grant(): Promise<void> {
    const person = current.value;
    const role = roleToGrant.value;
    if (!person || !role) return;
    busy.value = 'grant';
    try {
      current.value = await people.grantRole(person.id, role);
      roleToGrant.value = null;
      showSuccess('Role granted', `${person.name} is now ${ROLE_LABELS[role].label}.`);
    } catch (error) {
      showApiError(error, 'The role was not granted');
    } finally {
      busy.value = null;
    }
  }

  async function revoke(role: Role): Promise<void> {
    const person = current.value;
    if (!person) return;
    const self = person.id === session.person?.id && role === 'admin';
    const sure = await ask({
      header: `Revoke ${ROLE_LABELS[role].label}?`,
      message:
        `${person.name} loses what the role allows: ${ROLE_LABELS[role].description}` +
        (self ? ' This is your own admin role: you will lose access to the office pages.' : ''),
      acceptLabel: 'Revoke role',
      danger: true,
    });
    if (!sure) return;
    busy.value = `revoke-${role}`;
    try {
      current.value = await people.revokeRole(person.id, role);
      showSuccess('Role revoked', `${person.name} is no longer ${ROLE_LABELS[role].label}.`);
    } catch (error) {
      showApiError(error, 'The role was not revoked');
    } finally {
      busy.value = null;
    }
  }

  /** Sends only what changed, so a save never overwrites another admin's edit of another field. */
  async function save(): Promise<void> {
    const person = current.value;
    const parsed = form.validate();
    if (!person || !parsed) return;
    const patch: PersonPatch = {};
    if (parsed.name !== undefined && parsed.name !== person.name) patch.name = parsed.name;
    if (parsed.institutionId !== undefined && parsed.institutionId !== person.institutionId) patch.institutionId = parsed.institutionId;
    if (parsed.active !== undefined && parsed.active !== person.active) patch.active = parsed.active;
    if (Object.keys(patch).length === 0) return;
    busy.value = 'save';
    try {
      current.value = await people.update(person.id, patch);
      form.reset(detailsOf(current.value));
      showSuccess('Changes saved', `${current.value.name} was updated.`);
    } catch (error) {
      form.applyServerErrors(error);
      showApiError(error, 'The changes were not saved');
    } finally {
      busy.value = null;
    }
  }

  return { current, form, roleToGrant, grantable, busy, grant, revoke, save };
}
