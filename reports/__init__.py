"""Reports: assessment + findings -> PDF checklist, terminal summary, JSON; fingerprint; sign-off register."""
