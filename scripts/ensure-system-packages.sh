#!/usr/bin/env bash
# Makes sure the Debian packages the test suites need are installed (Chromium for browser tests,
# mosquitto and postgresql for the external-broker and PostgreSQL tests; those start their own
# throwaway servers, never the system services).
# As root on Debian it installs them; otherwise it stops and prints the exact command to run.
set -euo pipefail

missing=()
[ -x /usr/bin/chromium ] || missing+=(chromium)
[ -x /usr/sbin/mosquitto ] || missing+=(mosquitto)
compgen -G "/usr/lib/postgresql/*/bin/postgres" >/dev/null || missing+=(postgresql)

if [ ${#missing[@]} -eq 0 ]; then
  exit 0
fi

if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "Installing system packages for the tests: ${missing[*]}"
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq "${missing[@]}" >/dev/null
  # The package enables a system mosquitto on port 1883; the tests start their own, so stop it.
  if [[ " ${missing[*]} " == *" mosquitto "* ]] && command -v systemctl >/dev/null 2>&1; then
    systemctl disable --now mosquitto >/dev/null 2>&1 || true
  fi
  # Likewise the cluster the postgresql package creates on port 5432.
  if [[ " ${missing[*]} " == *" postgresql "* ]] && command -v systemctl >/dev/null 2>&1; then
    systemctl disable --now postgresql >/dev/null 2>&1 || true
  fi
  exit 0
fi

echo "The tests need these Debian packages: ${missing[*]}" >&2
echo "Install them with:  sudo apt-get update && sudo apt-get install -y ${missing[*]}" >&2
exit 1
