import { request } from './http'

export interface Health {
  status: 'ok' | 'degraded'
  database: 'up' | 'down'
}

export const getHealth = () => request<Health>('/health')
