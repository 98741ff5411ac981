import type { Profile } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { profileApi } from '../api/profile.api';

export const useProfileStore = defineStore('profile', () => {
  const profile = ref<Profile | null>(null);
  const loading = ref(false);

  /** Throws the ApiError so the view can say what went wrong. */
  async function load(): Promise<void> {
    loading.value = true;
    try {
      profile.value = await profileApi.get();
    } finally {
      loading.value = false;
    }
  }

  return { profile, loading, load };
});
