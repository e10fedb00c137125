import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { AgeThresholds, AgeThresholdTable } from '@shared/domain/age-categories'
import type { RequirementProfile } from '@shared/domain/audit/types'
import type { Discipline } from '@shared/domain/club'
import type { RequirementProfileInput } from '@shared/schemas/audits'
import * as api from '@/api/audits'
import { ApiError } from '@/api/http'

/** The club's requirement profiles and age thresholds: what the readiness check measures by. */
export const useAuditSettingsStore = defineStore('auditSettings', () => {
  const profiles = ref<RequirementProfile[]>([])
  const thresholds = ref<AgeThresholdTable | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)

  /** Loads both; the error is kept for the view to show. */
  async function load(clubId: string) {
    loading.value = true
    error.value = null
    try {
      ;[profiles.value, thresholds.value] = await Promise.all([
        api.listRequirementProfiles(clubId),
        api.getAgeThresholds(clubId),
      ])
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /** Saves one profile (directors); lets the ApiError and its field issues through. */
  async function saveProfile(clubId: string, input: RequirementProfileInput) {
    const saved = await api.saveRequirementProfile(clubId, input)
    const known = profiles.value.some((p) => p.id === saved.id)
    profiles.value = known
      ? profiles.value.map((p) => (p.id === saved.id ? saved : p))
      : [...profiles.value, saved]
    return saved
  }

  /**
   * Creates a profile (directors) and adds it at the end of the list, where its draft was. When
   * the id is taken (a profile created meanwhile elsewhere), the list is fetched again so that an
   * id derived from it next time is free; the ApiError goes through either way.
   */
  async function createProfile(clubId: string, input: RequirementProfileInput) {
    try {
      const created = await api.createRequirementProfile(clubId, input)
      profiles.value = [...profiles.value, created]
      return created
    } catch (err) {
      if (err instanceof ApiError && err.code === 'profile_exists') {
        const fresh = await api.listRequirementProfiles(clubId).catch(() => null)
        // Known profiles keep their objects, so that edits open in their editors are not reset.
        const known = new Map(profiles.value.map((p) => [p.id, p]))
        if (fresh) profiles.value = fresh.map((p) => known.get(p.id) ?? p)
      }
      throw err
    }
  }

  /**
   * Deletes a profile (directors) and drops it from the list. Resolves false when it had already
   * been deleted elsewhere (a 404): it is gone either way. Other errors go through.
   */
  async function deleteProfile(clubId: string, id: string) {
    let deleted = true
    try {
      await api.deleteRequirementProfile(clubId, id)
    } catch (err) {
      if (!(err instanceof ApiError && err.status === 404)) throw err
      deleted = false
    }
    profiles.value = profiles.value.filter((p) => p.id !== id)
    return deleted
  }

  /** Saves one discipline's age band (directors); lets the ApiError through. */
  async function saveThresholds(clubId: string, discipline: Discipline, input: AgeThresholds) {
    thresholds.value = await api.saveAgeThresholds(clubId, discipline, input)
  }

  return {
    profiles,
    thresholds,
    loading,
    error,
    load,
    createProfile,
    saveProfile,
    deleteProfile,
    saveThresholds,
  }
})
