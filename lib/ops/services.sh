#!/usr/bin/env bash
# Background services that run beside the web server (mail sink, mail worker).
# start_services LOGDIR / stop_services. Each capability adds its own service here.
start_services() {
  :
}

stop_services() {
  :
}

# The same services for a test run, on the test ports.
start_test_services() {
  :
}

stop_test_services() {
  :
}
