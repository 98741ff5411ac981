import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import InputText from 'primevue/inputtext';
import { describe, expect, it } from 'vitest';
import { defineComponent, h } from 'vue';
import EditableRowField from './editable-row-field.vue';
import EditableRows from './editable-rows.vue';

interface Shelf {
  label: string;
}

/** A list of shelves, one box each, the way the tiers and pools editors use the two components. */
function mountShelves(shelves: Shelf[], errors: Record<number, string> = {}, extra: Record<string, unknown> = {}) {
  const Host = defineComponent({
    setup: () => () =>
      h(
        EditableRows<Shelf>,
        {
          rows: shelves,
          rowName: 'shelf',
          listName: 'shelves',
          legend: 'Shelves',
          hint: 'One row per shelf.',
          columns: ['Label'],
          columnWidths: 'minmax(0, 1fr)',
          addLabel: 'Add a shelf',
          removeLabel: (shelf: Shelf, i: number) => `Remove shelf ${i + 1} (${shelf.label})`,
          ...extra,
        },
        {
          row: ({ row, index }: { row: Shelf; index: number }) =>
            h(
              EditableRowField,
              { inputId: `shelf-${index}-label`, label: `Label of shelf ${index + 1}`, error: errors[index] },
              {
                default: ({ invalid, describedBy }: { invalid: boolean; describedBy?: string }) =>
                  h(InputText, { id: `shelf-${index}-label`, modelValue: row.label, invalid, 'aria-describedby': describedBy }),
              },
            ),
        },
      ),
  });
  return mount(Host, { global: { plugins: [[PrimeVue, { theme: 'none' }]] } });
}

describe('EditableRows', () => {
  describe('rows', () => {
    it('should give each row its box, a hidden label, the column heads and a named remove button', () => {
      const wrapper = mountShelves([{ label: 'top' }, { label: 'bottom' }]);
      expect(wrapper.findAll('[data-testid^="shelf-row-"]')).toHaveLength(2);
      expect(wrapper.get('.head').text()).toBe('Label');
      expect(wrapper.get('.head').attributes('style')).toContain('grid-template-columns: minmax(0, 1fr) 2.5rem');
      expect(wrapper.get('label[for="shelf-1-label"]').text()).toBe('Label of shelf 2');
      expect(wrapper.get('[data-testid="shelf-remove-1"]').attributes('aria-label')).toBe('Remove shelf 2 (bottom)');
      expect(wrapper.get('fieldset').attributes('aria-describedby')).toBe('shelves-hint shelves-error');
      expect(wrapper.get('#shelves-hint').text()).toBe('One row per shelf.');
    });

    it('should leave out the column heads while there are no rows', () => {
      const wrapper = mountShelves([]);
      expect(wrapper.find('.head').exists()).toBe(false);
      expect(wrapper.find('[data-testid="shelf-add"]').exists()).toBe(true);
    });

    it('should disable the remove buttons when only the rows that must stay are left', () => {
      expect(mountShelves([{ label: 'only' }], {}, { minRows: 1 }).get('[data-testid="shelf-remove-0"]').attributes()).toHaveProperty('disabled');
      expect(mountShelves([{ label: 'only' }]).get('[data-testid="shelf-remove-0"]').attributes()).not.toHaveProperty('disabled');
    });
  });

  describe('adding and removing', () => {
    it('should ask the owner to add a row and to remove the row clicked', async () => {
      const asked: string[] = [];
      const handlers = { onAdd: () => asked.push('add'), onRemove: (i: number) => asked.push(`remove ${i}`) };
      const wrapper = mountShelves([{ label: 'top' }, { label: 'bottom' }], {}, handlers);
      await wrapper.get('[data-testid="shelf-remove-1"]').trigger('click');
      await wrapper.get('[data-testid="shelf-add"]').trigger('click');
      expect(asked).toEqual(['remove 1', 'add']);
    });
  });

  describe('errors', () => {
    it('should put a row’s error beside its box and tie it to the box, and the list’s error below', () => {
      const wrapper = mountShelves([{ label: 'top' }, { label: '' }], { 1: 'name the shelf' }, { listError: 'at most 2 shelves' });
      expect(wrapper.get('#shelf-1-label-error').text()).toBe('name the shelf');
      expect(wrapper.get('#shelf-1-label').attributes('aria-describedby')).toBe('shelf-1-label-error');
      expect(wrapper.get('#shelf-0-label').attributes('aria-describedby')).toBeUndefined();
      expect(wrapper.get('#shelves-error').text()).toBe('at most 2 shelves');
    });
  });
});
