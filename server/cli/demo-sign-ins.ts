import { demoPassword, demoPeople } from '../../seed/demo.ts'

export function printDemoSignIns() {
  const shown = demoPeople.filter((p) => !/^coach\d/.test(p.email))
  console.log(`Demo sign-ins (password for all: ${demoPassword}):`)
  for (const person of shown) console.log(`  ${person.role.padEnd(10)} ${person.email}`)
}
