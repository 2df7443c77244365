import { defineStore } from 'pinia'

// The calendar's view survives leaving the page: which cutter, which view, which date.
export const useCalendarStore = defineStore('calendar', {
  state: () => ({ cutterId: null as number | null, view: 'timeGridWeek' as 'dayGridMonth' | 'timeGridWeek' | 'timeGridDay', date: null as string | null }),
})
