import { defineStore } from 'pinia'

// The calendar's view survives leaving the page: which view and which date (the cutter is remembered in a cookie).
export const useCalendarStore = defineStore('calendar', {
  state: () => ({ view: 'timeGridWeek' as 'dayGridMonth' | 'timeGridWeek' | 'timeGridDay', date: null as string | null }),
})
