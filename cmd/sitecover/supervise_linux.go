package main

import "syscall"

// childProcAttr makes the child die with the supervisor.
func childProcAttr() *syscall.SysProcAttr {
	return &syscall.SysProcAttr{Pdeathsig: syscall.SIGKILL}
}
