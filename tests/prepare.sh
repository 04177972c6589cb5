#!/usr/bin/env bash
# Makes sure what the tests need is there; run by `npm test` before the test runner.
# - Mosquitto on 127.0.0.1:1883 for the external-broker tests (MQTT_TEST_URL). Skipped, with a
#   message, on a machine without mosquitto: the embedded-broker tests still run.
# - Chromium for the browser tests (Debian's package; npm cannot download a browser here).
set -uo pipefail

port_open() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

if command -v mosquitto >/dev/null 2>&1; then
  if ! port_open 1883; then
    echo "prepare: starting mosquitto on 127.0.0.1:1883"
    mosquitto -d -c /etc/mosquitto/mosquitto.conf 2>/dev/null || mosquitto -d -p 1883
    sleep 1
  fi
else
  echo "prepare: mosquitto is not installed; external-broker tests will be skipped (apt-get install mosquitto)"
fi

if ! command -v chromium >/dev/null 2>&1; then
  if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
    echo "prepare: installing Debian's chromium for the browser tests"
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null) || echo "prepare: could not install chromium"
  else
    echo "prepare: chromium is missing; install it (apt-get install chromium) to run the browser tests"
  fi
fi
exit 0
