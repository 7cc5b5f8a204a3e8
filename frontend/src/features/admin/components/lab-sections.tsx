import { NavLink } from 'react-router-dom';
import './lab-admin.css';
import { IconClock, IconLab, IconOverview, IconQueue, IconWorker } from '@/components/icons';
import { paths } from '@/config/paths';

/** A share of a whole: the quota icon, drawn like Kiln's other line icons. */
function IconShare() {
  return (
    <svg width="1em" height="1em" viewBox="0 0 16 16" fill="none" stroke="currentColor" strokeWidth={1.6} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true" focusable="false">
      <circle cx="8" cy="8" r="6.2" />
      <path d="M8 1.8V8l4.4 4.4" />
    </svg>
  );
}

const sections = [
  { href: paths.lab.getHref(), label: 'People', hint: 'roles and access', icon: <IconLab />, end: true },
  { href: paths.labQuotas.getHref(), label: 'Quotas', hint: 'slots and CPU-hours', icon: <IconShare />, end: false },
  { href: paths.labWorkers.getHref(), label: 'Workers', hint: 'hosts and heartbeats', icon: <IconWorker />, end: false },
  { href: paths.labUsage.getHref(), label: 'Usage', hint: 'CPU-hours by month', icon: <IconOverview />, end: false },
  { href: paths.labAudit.getHref(), label: 'Audit log', hint: 'who changed what', icon: <IconClock />, end: false },
  { href: paths.labOutbox.getHref(), label: 'Outbox', hint: 'mail, local mode', icon: <IconQueue />, end: false },
];

/** The lab admin's sections, one line under the page title. */
export function LabSections() {
  return (
    <nav className="lab-sections" aria-label="Lab sections">
      {sections.map((section) => (
        <NavLink
          key={section.href}
          to={section.href}
          end={section.end}
          className={({ isActive }) => `lab-sections__link${isActive ? ' lab-sections__link--current' : ''}`}
        >
          <span className="lab-sections__icon">{section.icon}</span>
          <span className="lab-sections__text">
            <span className="lab-sections__label">{section.label}</span>
            <span className="lab-sections__hint">{section.hint}</span>
          </span>
        </NavLink>
      ))}
    </nav>
  );
}
