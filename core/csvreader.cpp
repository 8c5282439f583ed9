// placeholder: implemented in this issue
