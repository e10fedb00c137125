import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { AgeThresholds, AgeThresholdTable } from '@shared/domain/age-categories'
import type { RequirementProfile } from '@shared/domain/audit'
import type { Discipline } from '@shared/domain/club'
import type { RequirementProfileInput } from '@shared/schemas/audits'
import * as api from '@/api/audits'

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

  /** Saves one discipline's age band (directors); lets the ApiError through. */
  async function saveThresholds(clubId: string, discipline: Discipline, input: AgeThresholds) {
    thresholds.value = await api.saveAgeThresholds(clubId, discipline, input)
  }

  return { profiles, thresholds, loading, error, load, saveProfile, saveThresholds }
})
